"use client"

import { zodResolver } from "@hookform/resolvers/zod"
import { useQuery, useQueryClient } from "@tanstack/react-query"
import { Plus, ShieldAlert, Trash2, TriangleAlert } from "lucide-react"
import { useEffect, useState } from "react"
import { useFieldArray, useForm, useWatch } from "react-hook-form"
import { apiFetch, ApiError } from "@/lib/api/client"
import { Button } from "@/components/ui/button"
import { Field, Input, Select, Textarea } from "@/components/ui/field"
import { errorAt, FormDone, FormProblem, Options, showApiProblem } from "@/components/ui/form"
import {
  SCAN_RESULT_LABEL,
  SCAN_RESULTS,
  SETUP_MEASUREMENT_KEYS,
  SETUP_MEASUREMENT_LABEL,
  isOutOfTolerance,
  sentRows,
  setupFieldsOnFormRows,
  setupFormSchema,
  setupOverrideSchema,
  typedNumber,
  type ScanResult,
  type SetupFormRow,
  type SetupFormValues,
  type SetupInput,
  type SetupMeasurementKey,
} from "@/lib/setup"

type MeasurementView = {
  key: SetupMeasurementKey
  label?: string
  value: number
  specified: number
  tolerance: number
  unit: string
  outOfTolerance: boolean
}
export type SetupView = {
  measurements: MeasurementView[]
  scanResult: ScanResult
  scanNotes: string
  outOfTolerance: number
  override: { note: string; by: string | null; at: string } | null
  blocksRoadTest: boolean
  updatedBy: string | null
  updatedAt: string
}

const emptyRow = (key: SetupMeasurementKey = "target_distance"): SetupFormRow => ({
  key,
  label: "",
  value: "",
  specified: "",
  tolerance: "",
  unit: "mm",
})
const toRow = (m: MeasurementView): SetupFormRow => ({
  key: m.key,
  label: m.label ?? "",
  value: String(m.value),
  specified: String(m.specified),
  tolerance: String(m.tolerance),
  unit: m.unit,
})
/** The form's values for a stored set-up, or a blank form. */
const formValues = (setup: SetupView | null | undefined): SetupFormValues => ({
  measurements: setup?.measurements.length ? setup.measurements.map(toRow) : [emptyRow()],
  scanResult: setup?.scanResult ?? "not_run",
  scanNotes: setup?.scanNotes ?? "",
})

/** The static set-up of one task: figures typed from the maker's service information, scan tool result, a lead's override. */
export function SetupForm({
  jobId,
  taskId,
  canEdit,
  isLead,
  index,
}: {
  jobId: string
  taskId: string
  canEdit: boolean
  isLead: boolean
  index: number
}) {
  const queryClient = useQueryClient()
  const url = `/api/jobs/${jobId}/tasks/${taskId}/setup`
  const { data: setup } = useQuery({
    queryKey: ["setup", taskId],
    queryFn: async () => (await apiFetch<{ setup: SetupView | null }>(url)).setup,
  })
  const [problem, setProblem] = useState<string | null>(null)
  const [done, setDone] = useState<string | null>(null)
  const form = useForm<SetupFormValues, unknown, SetupInput>({
    resolver: zodResolver(setupFormSchema),
    defaultValues: formValues(setup),
  })
  const rows = useFieldArray({ control: form.control, name: "measurements" })
  const typed = useWatch({ control: form.control, name: "measurements" })
  const { errors, isSubmitting } = form.formState
  // Each stored set-up that arrives (the first load, a save, an override) fills the form with what is on record.
  const { reset } = form
  useEffect(() => {
    if (setup) reset(formValues(setup))
  }, [setup, reset])

  const refresh = async (fresh: SetupView) => {
    queryClient.setQueryData(["setup", taskId], fresh)
    await queryClient.invalidateQueries({ queryKey: ["job", jobId] })
  }
  const save = async (body: SetupInput) => {
    // The API numbers the measurements it was sent; the form's rows also count the blank ones left out.
    const sent = sentRows(form.getValues("measurements"))
    try {
      const res = await apiFetch<{ setup: SetupView }>(url, { method: "PUT", body })
      await refresh(res.setup)
      setDone(res.setup.blocksRoadTest ? "Saved. Out-of-tolerance figures hold the road test." : "Set-up saved.")
    } catch (e) {
      const onRows =
        e instanceof ApiError && e.fields ? new ApiError(e.message, e.status, setupFieldsOnFormRows(e.fields, sent)) : e
      setProblem(showApiProblem(form, onRows, "That did not save."))
    }
  }
  const id = (what: string, i?: number) => `setup-${index}-${what}${i === undefined ? "" : `-${i}`}`
  const err = (path: string) => errorAt(errors, path)

  return (
    <div className="space-y-3" data-testid={`setup-form-${index}`}>
      <p className="flex gap-2 rounded-lg border-2 border-signal-500 p-2 text-sm dark:border-signal-400">
        <ShieldAlert aria-hidden className="size-5 shrink-0" />
        Enter each figure, its specified value and its tolerance from the vehicle maker&apos;s service information for
        this vehicle. Straightaway holds no maker&apos;s values.
      </p>
      {setup?.blocksRoadTest ? (
        <p
          role="alert"
          className="flex gap-2 font-semibold text-stop-700 dark:text-stop-400"
          data-testid="setup-blocks"
        >
          <TriangleAlert aria-hidden className="size-5 shrink-0" /> {setup.outOfTolerance} out of tolerance: the road
          test waits until the set-up is corrected or a shop lead overrides with a note.
        </p>
      ) : null}
      {setup?.override ? (
        <p className="text-sm" data-testid="setup-override">
          Overridden by {setup.override.by ?? "a shop lead"}: {setup.override.note}
        </p>
      ) : null}
      <form
        className="space-y-3"
        noValidate
        onSubmit={(e) => {
          setProblem(null)
          setDone(null)
          return form.handleSubmit(save)(e)
        }}
      >
        <FormProblem className="text-sm">{err("measurements.root") ?? err("measurements")}</FormProblem>
        <ul className="space-y-3">
          {rows.fields.map((field, i) => {
            const r = typed?.[i] ?? field
            const v = typedNumber(r.value)
            const s = typedNumber(r.specified)
            const t = typedNumber(r.tolerance)
            const figures = [v, s, t].every(Number.isFinite)
            const out = figures && isOutOfTolerance({ value: v, specified: s, tolerance: t })
            // One text box of the row: its id, its error and its value all follow from its name.
            const box = (name: Exclude<keyof SetupFormRow, "key">, label: string, inputMode?: "decimal") => (
              <Field label={label} htmlFor={id(name, i)} error={err(`measurements.${i}.${name}`)}>
                <Input
                  id={id(name, i)}
                  inputMode={inputMode}
                  disabled={!canEdit}
                  {...form.register(`measurements.${i}.${name}`)}
                />
              </Field>
            )
            return (
              <li
                key={field.id}
                className="grid grid-cols-2 gap-2 rounded-lg border border-graphite-200 p-2 sm:grid-cols-6 dark:border-asphalt-700"
              >
                <div className="col-span-2">
                  <Field label="Measurement" htmlFor={id("key", i)} error={err(`measurements.${i}.key`)}>
                    <Select id={id("key", i)} disabled={!canEdit} {...form.register(`measurements.${i}.key`)}>
                      <Options values={SETUP_MEASUREMENT_KEYS} labels={SETUP_MEASUREMENT_LABEL} />
                    </Select>
                  </Field>
                  {r.key === "other" ? box("label", "Name") : null}
                </div>
                {box("value", "Measured", "decimal")}
                {box("specified", "Specified", "decimal")}
                {box("tolerance", "Tolerance (±)", "decimal")}
                {box("unit", "Unit")}
                <div className="col-span-2 flex items-center justify-between gap-2 sm:col-span-6">
                  <span
                    className={
                      out
                        ? "flex items-center gap-1 font-semibold text-stop-700 dark:text-stop-400"
                        : "text-sm text-graphite-600 dark:text-graphite-300"
                    }
                  >
                    {out ? (
                      <>
                        <TriangleAlert aria-hidden className="size-4" /> Out of tolerance
                      </>
                    ) : figures ? (
                      "In tolerance"
                    ) : (
                      ""
                    )}
                  </span>
                  {canEdit && rows.fields.length > 1 ? (
                    <Button
                      variant="ghost"
                      size="sm"
                      onClick={() => rows.remove(i)}
                      aria-label={`Remove measurement ${i + 1}`}
                    >
                      <Trash2 aria-hidden className="size-4" />
                    </Button>
                  ) : null}
                </div>
              </li>
            )
          })}
        </ul>
        {canEdit ? (
          <Button
            variant="outline"
            size="sm"
            onClick={() => rows.append(emptyRow("target_height"), { shouldFocus: false })}
          >
            <Plus aria-hidden className="size-4" /> Add a measurement
          </Button>
        ) : null}
        <Field label="Scan tool result" htmlFor={id("scan")} error={err("scanResult")}>
          <Select id={id("scan")} disabled={!canEdit} {...form.register("scanResult")}>
            <Options values={SCAN_RESULTS} labels={SCAN_RESULT_LABEL} />
          </Select>
        </Field>
        <Field
          label="Scan tool notes"
          htmlFor={id("scan-notes")}
          error={err("scanNotes")}
          hint="Codes read, the tool's own wording. Photos of the set-up and printouts go under Photos and printouts."
        >
          <Textarea id={id("scan-notes")} disabled={!canEdit} {...form.register("scanNotes")} />
        </Field>
        {canEdit ? (
          <Button type="submit" data-testid={`setup-save-${index}`} disabled={isSubmitting}>
            {isSubmitting ? "Saving…" : "Save the set-up"}
          </Button>
        ) : null}
      </form>
      {isLead && setup?.blocksRoadTest ? (
        <OverrideForm
          url={`${url}/override`}
          id={id("override")}
          onStart={() => setProblem(null)}
          onProblem={setProblem}
          onSaved={async (fresh) => {
            await refresh(fresh)
            setDone("Override saved: the road test may start.")
          }}
        />
      ) : null}
      <FormProblem>{problem}</FormProblem>
      <FormDone>{done}</FormDone>
    </div>
  )
}

/** A shop lead's override of figures out of tolerance: the note says why the road test may go ahead. */
function OverrideForm({
  url,
  id,
  onStart,
  onProblem,
  onSaved,
}: {
  url: string
  id: string
  onStart: () => void
  onProblem: (problem: string) => void
  onSaved: (fresh: SetupView) => Promise<void>
}) {
  const form = useForm<{ note: string }>({ resolver: zodResolver(setupOverrideSchema), defaultValues: { note: "" } })
  const note = useWatch({ control: form.control, name: "note" })
  const override = async ({ note }: { note: string }) => {
    try {
      const res = await apiFetch<{ setup: SetupView }>(url, { method: "POST", body: { note } })
      form.reset()
      await onSaved(res.setup)
    } catch (e) {
      onProblem(showApiProblem(form, e, "That did not save."))
    }
  }
  return (
    <form
      className="space-y-2 rounded-lg border border-graphite-200 p-2 dark:border-asphalt-700"
      noValidate
      onSubmit={(e) => {
        onStart()
        return form.handleSubmit(override)(e)
      }}
    >
      <Field
        label="Lead's override: why the road test may go ahead"
        htmlFor={id}
        error={errorAt(form.formState.errors, "note")}
      >
        <Textarea id={id} {...form.register("note")} />
      </Field>
      <Button type="submit" variant="danger" disabled={!note.trim() || form.formState.isSubmitting}>
        Override with this note
      </Button>
    </form>
  )
}
