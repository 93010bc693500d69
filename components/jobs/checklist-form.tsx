"use client"

import { zodResolver } from "@hookform/resolvers/zod"
import { useQueryClient } from "@tanstack/react-query"
import { CircleAlert, CircleCheck, TriangleAlert } from "lucide-react"
import { useState } from "react"
import { useForm, useWatch, type FieldPath } from "react-hook-form"
import { Button } from "@/components/ui/button"
import { apiFetch } from "@/lib/api/client"
import { Field, Input, Select, Textarea } from "@/components/ui/field"
import { errorAt as errorIn, FormDone, FormProblem, Options, showApiProblem } from "@/components/ui/form"
import { alignmentRequired, checkTires, kpaToPsi, psiToKpa } from "@/lib/checklist"
import {
  checklistSchema,
  FUEL_LABEL,
  FUEL_LEVELS,
  WHEEL_LABEL,
  WHEELS,
  type ChecklistData,
  type ChecklistInput,
} from "@/lib/validation/checklist"

export type ChecklistView = ChecklistData & {
  completedBy: string | null
  completedAt: string
  ready: boolean
  blockers: { key: string; message: string }[]
}

function blankChecklist(task: { method: string; reason: string }, unit: "psi" | "kPa"): ChecklistInput {
  return {
    faultCodes: { none: false, expected: [] },
    tires: { unit, placard: "", fl: "", fr: "", rl: "", rr: "" },
    loadNormal: false,
    fuelLevel: "1/2",
    sensorClean: false,
    mountUndamaged: false,
    alignmentChecked: alignmentRequired(task) ? false : null,
    notes: "",
  }
}

const round1 = (n: number) => Math.round(n * 10) / 10

/** The checks before a drive, for one calibration. The server stores who saved it and when, and decides `ready`. */
export function ChecklistForm({
  jobId,
  task,
  saved,
  tolerancePsi,
  metric,
  canEdit,
}: {
  jobId: string
  task: { id: string; method: string; reason: string }
  saved: ChecklistView | null
  tolerancePsi: number
  metric: boolean
  canEdit: boolean
}) {
  const queryClient = useQueryClient()
  const [problem, setProblem] = useState<string | null>(null)
  const [savedNow, setSavedNow] = useState(false)
  const needsAlignment = alignmentRequired(task)
  const form = useForm<ChecklistInput, unknown, ChecklistData>({
    resolver: zodResolver(checklistSchema),
    defaultValues: saved
      ? {
          faultCodes: saved.faultCodes,
          tires: saved.tires,
          loadNormal: saved.loadNormal,
          fuelLevel: saved.fuelLevel,
          sensorClean: saved.sensorClean,
          mountUndamaged: saved.mountUndamaged,
          alignmentChecked: needsAlignment ? Boolean(saved.alignmentChecked) : saved.alignmentChecked,
          notes: saved.notes,
        }
      : blankChecklist(task, metric ? "kPa" : "psi"),
  })
  const [codesText, setCodesText] = useState((saved?.faultCodes.expected ?? []).join(", "))
  const { errors, isSubmitting } = form.formState
  const tires = useWatch({ control: form.control, name: "tires" })
  const noCodes = useWatch({ control: form.control, name: "faultCodes.none" })
  const prefix = `task-${task.id.slice(0, 8)}`

  // Live flags while typing: the same rule the server applies.
  const numbers = WHEELS.map((w) => Number(tires[w]))
  const placard = Number(tires.placard)
  const liveChecks =
    tires.placard !== "" && placard > 0
      ? checkTires(
          { unit: tires.unit, placard, fl: numbers[0]!, fr: numbers[1]!, rl: numbers[2]!, rr: numbers[3]! },
          tolerancePsi,
        )
      : null
  const toleranceText = tires.unit === "psi" ? `${tolerancePsi} psi` : `${round1(psiToKpa(tolerancePsi))} kPa`

  function switchUnit(unit: "psi" | "kPa") {
    if (unit === tires.unit) return
    const convert = (v: unknown) => {
      const n = Number(v)
      if (v === "" || !Number.isFinite(n)) return v as string
      return String(round1(unit === "kPa" ? psiToKpa(n) : kpaToPsi(n)))
    }
    form.setValue("tires", {
      unit,
      placard: convert(tires.placard),
      fl: convert(tires.fl),
      fr: convert(tires.fr),
      rl: convert(tires.rl),
      rr: convert(tires.rr),
    })
  }

  async function save(values: ChecklistData) {
    setProblem(null)
    setSavedNow(false)
    try {
      await apiFetch(`/api/jobs/${jobId}/tasks/${task.id}/checklist`, { method: "PUT", body: values })
      await queryClient.invalidateQueries({ queryKey: ["job", jobId] })
      setSavedNow(true)
    } catch (error) {
      setProblem(showApiProblem(form, error, "That did not save."))
    }
  }

  const errorAt = (path: string) => errorIn(errors, path)

  const check = (name: FieldPath<ChecklistInput>, label: string, hint?: string) => (
    <label className="flex min-h-12 items-start gap-3 py-1">
      <input
        type="checkbox"
        className="mt-1 size-6 shrink-0 accent-graphite-900 dark:accent-signal-400"
        disabled={!canEdit}
        {...form.register(name)}
      />
      <span>
        <span className="font-medium">{label}</span>
        {hint ? <span className="block text-sm text-graphite-600 dark:text-graphite-300">{hint}</span> : null}
      </span>
    </label>
  )

  return (
    <form onSubmit={form.handleSubmit(save)} className="space-y-4" noValidate aria-label="Pre-drive checklist">
      <fieldset className="space-y-1" disabled={!canEdit}>
        <legend className="font-semibold">Stored fault codes (DTCs)</legend>
        {check("faultCodes.none", "No fault codes stored", "Scan before driving.")}
        {!noCodes ? (
          <Field
            label="Codes you expect (comma between)"
            htmlFor={`${prefix}-codes`}
            error={errorAt("faultCodes.expected")}
            hint="e.g. the sensor's own 'calibration needed' code"
          >
            <Input
              id={`${prefix}-codes`}
              value={codesText}
              autoCapitalize="characters"
              onChange={(e) => {
                setCodesText(e.target.value)
                const codes = e.target.value
                  .split(/[,\s]+/)
                  .map((c) => c.trim())
                  .filter(Boolean)
                form.setValue("faultCodes.expected", codes, { shouldValidate: form.formState.isSubmitted })
              }}
            />
          </Field>
        ) : null}
      </fieldset>

      <fieldset className="space-y-2" disabled={!canEdit}>
        <legend className="font-semibold">Tire pressure</legend>
        <div className="flex items-end gap-3">
          <Field label="Door placard" htmlFor={`${prefix}-placard`} error={errorAt("tires.placard")}>
            <Input
              id={`${prefix}-placard`}
              inputMode="decimal"
              className="w-28 tabular"
              {...form.register("tires.placard")}
            />
          </Field>
          <div role="group" aria-label="Pressure unit" className="flex gap-1 pb-0.5">
            {(["psi", "kPa"] as const).map((u) => (
              <Button
                key={u}
                size="sm"
                variant={tires.unit === u ? "primary" : "outline"}
                aria-pressed={tires.unit === u}
                onClick={() => switchUnit(u)}
              >
                {u}
              </Button>
            ))}
          </div>
        </div>
        <div className="grid grid-cols-2 gap-3">
          {WHEELS.map((w, i) => {
            const flag = liveChecks && tires[w] !== "" && Number.isFinite(numbers[i]) ? liveChecks[i]! : null
            return (
              <Field
                key={w}
                label={`${WHEEL_LABEL[w]} (${tires.unit})`}
                htmlFor={`${prefix}-${w}`}
                error={errorAt(`tires.${w}`)}
              >
                <Input id={`${prefix}-${w}`} inputMode="decimal" className="tabular" {...form.register(`tires.${w}`)} />
                {flag ? (
                  flag.ok ? (
                    <p className="flex items-center gap-1 text-sm text-graphite-700 dark:text-graphite-200">
                      <CircleCheck aria-hidden className="size-4 text-teal-600" /> Within {toleranceText}
                    </p>
                  ) : (
                    <p
                      className="flex items-center gap-1 text-sm font-medium text-stop-600 dark:text-stop-400"
                      data-testid={`tire-flag-${w}`}
                    >
                      <TriangleAlert aria-hidden className="size-4" /> {round1(Math.abs(flag.difference))} {tires.unit}{" "}
                      {flag.difference > 0 ? "over" : "under"}
                    </p>
                  )
                ) : null}
              </Field>
            )
          })}
        </div>
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          The shop allows {toleranceText} either side of the placard.
        </p>
      </fieldset>

      <fieldset className="space-y-1" disabled={!canEdit}>
        <legend className="font-semibold">Vehicle and sensor</legend>
        {check("loadNormal", "Load normal", "No heavy cargo, nothing towed, spare and jack in place.")}
        <Field label="Fuel" htmlFor={`${prefix}-fuel`} error={errorAt("fuelLevel")}>
          <Select id={`${prefix}-fuel`} {...form.register("fuelLevel")}>
            <Options values={FUEL_LEVELS} labels={FUEL_LABEL} />
          </Select>
        </Field>
        {check("sensorClean", "Sensor face clean", "Cover or glass in front of it clean and free of stickers.")}
        {check("mountUndamaged", "Mount and bracket undamaged")}
        {needsAlignment
          ? check("alignmentChecked", "Wheel alignment checked", "Needed after an alignment or for a target set-up.")
          : null}
      </fieldset>

      <Field label="Notes" htmlFor={`${prefix}-notes`} error={errorAt("notes")}>
        <Textarea id={`${prefix}-notes`} disabled={!canEdit} {...form.register("notes")} />
      </Field>

      <FormProblem>{problem}</FormProblem>
      {canEdit ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting}>
            {isSubmitting ? "Saving…" : "Save checklist"}
          </Button>
          <FormDone className="text-sm">{savedNow ? "Saved" : null}</FormDone>
        </div>
      ) : null}
      {saved && !saved.ready ? (
        <ul className="space-y-1" aria-label="Before driving">
          {saved.blockers.map((b) => (
            <li key={b.key} className="flex items-start gap-2 text-sm font-medium text-stop-600 dark:text-stop-400">
              <CircleAlert aria-hidden className="mt-0.5 size-4 shrink-0" /> {b.message}
            </li>
          ))}
        </ul>
      ) : null}
    </form>
  )
}
