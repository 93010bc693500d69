"use client"

import { CircleAlert, CircleCheck } from "lucide-react"
import type { InputHTMLAttributes } from "react"
import { Input } from "@/components/ui/field"
import { checkVin } from "@/lib/vin"

/** The VIN box: says what is wrong as it is typed (49 CFR 565 check digit, letters, length) and the model year. */
export function VinField({ value, serverError, ...props }: { value: string; serverError?: string } & InputHTMLAttributes<HTMLInputElement>) {
  const typed = value.trim()
  const check = typed ? checkVin(typed) : null
  const problems = check?.problems ?? []
  const describedBy = "vin-status"
  return (
    <div className="space-y-1">
      <label htmlFor="vin" className="block text-sm font-semibold text-graphite-700 dark:text-graphite-200">
        VIN
      </label>
      <Input
        id="vin"
        autoComplete="off"
        autoCapitalize="characters"
        spellCheck={false}
        maxLength={20}
        className="font-mono tracking-wider uppercase"
        aria-invalid={problems.length > 0 || Boolean(serverError)}
        aria-describedby={describedBy}
        {...props}
      />
      <div id={describedBy} aria-live="polite" className="min-h-6 text-sm">
        {!check ? (
          <p className="text-graphite-500 dark:text-graphite-300">17 characters, from the windshield plate or the door label.</p>
        ) : check.valid ? (
          <p className="flex items-center gap-1 font-medium text-graphite-800 dark:text-graphite-100">
            <CircleCheck aria-hidden className="size-4 text-teal-600" />
            Check digit {check.checkDigit} is right{check.modelYear ? ` · model year ${check.modelYear}` : ""}.
          </p>
        ) : (
          <ul className="space-y-0.5 font-medium text-stop-600 dark:text-stop-400" data-testid="vin-problems">
            {problems.map((p) => (
              <li key={p} className="flex items-start gap-1">
                <CircleAlert aria-hidden className="mt-0.5 size-4 shrink-0" />
                {p}
              </li>
            ))}
            {check.modelYear ? <li className="text-graphite-600 dark:text-graphite-300">Model year from position 10: {check.modelYear}.</li> : null}
          </ul>
        )}
        {serverError && check?.valid ? <p className="font-medium text-stop-600">{serverError}</p> : null}
      </div>
    </div>
  )
}
