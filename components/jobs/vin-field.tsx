"use client"

import { CircleAlert, CircleCheck } from "lucide-react"
import type { InputHTMLAttributes } from "react"
import { Input } from "@/components/ui/field"
import { checkVin } from "@/lib/vin"

/** The VIN box: says what is wrong as it is typed (49 CFR 565 check digit, letters, length) and the model year. */
export function VinField({
  value,
  serverError,
  chosenYear,
  onChooseYear,
  ...props
}: {
  value: string
  serverError?: string
  chosenYear?: string
  onChooseYear?: (year: number) => void
} & InputHTMLAttributes<HTMLInputElement>) {
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
          <p className="text-graphite-500 dark:text-graphite-300">
            17 characters, from the windshield plate or the door label.
          </p>
        ) : check.valid ? (
          <p className="flex items-center gap-1 font-medium text-graphite-800 dark:text-graphite-100">
            <CircleCheck aria-hidden className="size-4 text-teal-600" />
            Check digit {check.checkDigit} is right
            {check.modelYear && check.modelYearChoices.length < 2 ? ` · model year ${check.modelYear}` : ""}.
          </p>
        ) : (
          <ul className="space-y-0.5 font-medium text-stop-600 dark:text-stop-400" data-testid="vin-problems">
            {problems.map((p) => (
              <li key={p} className="flex items-start gap-1">
                <CircleAlert aria-hidden className="mt-0.5 size-4 shrink-0" />
                {p}
              </li>
            ))}
            {check.modelYear ? (
              <li className="text-graphite-600 dark:text-graphite-300">
                Model year from position 10: {check.modelYear}.
              </li>
            ) : null}
          </ul>
        )}
        {check?.valid && check.modelYearChoices.length === 2 ? (
          <YearChoice
            choices={check.modelYearChoices as [number, number]}
            chosen={chosenYear}
            onChoose={onChooseYear}
          />
        ) : null}
        {serverError && check?.valid ? <p className="font-medium text-stop-600">{serverError}</p> : null}
      </div>
    </div>
  )
}

/**
 * Position 10 stands for two model years 30 years apart; position 7 settles it only for cars, SUVs, vans and
 * light trucks (49 CFR 565.15(b)). Both years are shown and the person says which.
 */
function YearChoice({
  choices,
  chosen,
  onChoose,
}: {
  choices: [number, number]
  chosen?: string
  onChoose?: (year: number) => void
}) {
  const [light, other] = choices
  const settled = chosen === String(light) || chosen === String(other)
  return (
    <fieldset className="mt-1 space-y-1" data-testid="vin-year-choice">
      <legend className="font-medium">
        Model year {light} or {other}? {settled ? `You chose ${chosen}.` : "Which is it?"}
      </legend>
      <p className="text-graphite-600 dark:text-graphite-300">
        {light} for a car, SUV, van or light truck; {other} is possible for a heavier truck, a bus, a trailer or a
        motorcycle.
      </p>
      {onChoose ? (
        <div className="flex gap-2">
          {[light, other].map((y) => (
            <button
              key={y}
              type="button"
              aria-pressed={chosen === String(y)}
              onClick={() => onChoose(y)}
              className="min-h-12 rounded-lg border-2 border-graphite-300 px-4 font-semibold aria-pressed:border-graphite-900 aria-pressed:bg-graphite-900 aria-pressed:text-white dark:border-graphite-600 dark:aria-pressed:border-signal-400 dark:aria-pressed:bg-signal-400 dark:aria-pressed:text-graphite-950"
              data-testid={`vin-year-${y}`}
            >
              {y}
            </button>
          ))}
        </div>
      ) : null}
    </fieldset>
  )
}
