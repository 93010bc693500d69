"use client"

import { useQuery, useQueryClient } from "@tanstack/react-query"
import { Plus, ShieldAlert, Trash2, TriangleAlert } from "lucide-react"
import { useState } from "react"
import { apiFetch, ApiError } from "@/lib/api/client"
import { Button } from "@/components/ui/button"
import { Field, Input, Select, Textarea } from "@/components/ui/field"
import { FormDone, FormProblem, Options } from "@/components/ui/form"
import {
  SCAN_RESULT_LABEL,
  SCAN_RESULTS,
  SETUP_MEASUREMENT_KEYS,
  SETUP_MEASUREMENT_LABEL,
  isOutOfTolerance,
  type ScanResult,
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
type Row = {
  key: SetupMeasurementKey
  label: string
  value: string
  specified: string
  tolerance: string
  unit: string
}

const emptyRow = (key: SetupMeasurementKey = "target_distance"): Row => ({
  key,
  label: "",
  value: "",
  specified: "",
  tolerance: "",
  unit: "mm",
})
const toRow = (m: MeasurementView): Row => ({
  key: m.key,
  label: m.label ?? "",
  value: String(m.value),
  specified: String(m.specified),
  tolerance: String(m.tolerance),
  unit: m.unit,
})
const num = (s: string) => (s.trim() === "" ? Number.NaN : Number(s.replace(",", ".")))

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
  const [rows, setRows] = useState<Row[]>([emptyRow()])
  const [scanResult, setScanResult] = useState<ScanResult>("not_run")
  const [scanNotes, setScanNotes] = useState("")
  const [note, setNote] = useState("")
  const [problem, setProblem] = useState<string | null>(null)
  const [fields, setFields] = useState<Record<string, string>>({})
  const [done, setDone] = useState<string | null>(null)
  // A stored set-up fills the form when it arrives (or changes), during render: React's "adjusting state when a prop
  // changes" pattern, without a second render pass from an effect.
  const [shownSetup, setShownSetup] = useState<SetupView | null>(null)
  if (setup && setup !== shownSetup) {
    setShownSetup(setup)
    setRows(setup.measurements.length ? setup.measurements.map(toRow) : [emptyRow()])
    setScanResult(setup.scanResult)
    setScanNotes(setup.scanNotes)
  }

  const refresh = async (fresh: SetupView) => {
    queryClient.setQueryData(["setup", taskId], fresh)
    await queryClient.invalidateQueries({ queryKey: ["job", jobId] })
  }
  const save = async () => {
    setProblem(null)
    setFields({})
    setDone(null)
    try {
      const body = {
        measurements: rows
          .filter((r) => r.value || r.specified || r.tolerance)
          .map((r) => ({
            key: r.key,
            ...(r.label.trim() ? { label: r.label.trim() } : {}),
            value: num(r.value),
            specified: num(r.specified),
            tolerance: num(r.tolerance),
            unit: r.unit,
          })),
        scanResult,
        scanNotes,
      }
      const res = await apiFetch<{ setup: SetupView }>(url, { method: "PUT", body })
      await refresh(res.setup)
      setDone(res.setup.blocksRoadTest ? "Saved. Out-of-tolerance figures hold the road test." : "Set-up saved.")
    } catch (e) {
      setProblem(e instanceof Error ? e.message : "That did not save.")
      if (e instanceof ApiError && e.fields) setFields(e.fields)
    }
  }
  const override = async () => {
    setProblem(null)
    try {
      const res = await apiFetch<{ setup: SetupView }>(`${url}/override`, { method: "POST", body: { note } })
      await refresh(res.setup)
      setNote("")
      setDone("Override saved: the road test may start.")
    } catch (e) {
      setProblem(e instanceof Error ? e.message : "That did not save.")
    }
  }
  const update = (i: number, patch: Partial<Row>) =>
    setRows((rs) => rs.map((r, j) => (j === i ? { ...r, ...patch } : r)))
  const id = (what: string, i?: number) => `setup-${index}-${what}${i === undefined ? "" : `-${i}`}`

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
      <ul className="space-y-3">
        {rows.map((r, i) => {
          const v = num(r.value)
          const s = num(r.specified)
          const t = num(r.tolerance)
          const out = [v, s, t].every(Number.isFinite) && isOutOfTolerance({ value: v, specified: s, tolerance: t })
          // One text box of the row: its id, its error from the server and its change all follow from its name.
          const box = (name: Exclude<keyof Row, "key">, label: string, inputMode?: "decimal") => (
            <Field label={label} htmlFor={id(name, i)} error={fields[`measurements.${i}.${name}`]}>
              <Input
                id={id(name, i)}
                inputMode={inputMode}
                value={r[name]}
                disabled={!canEdit}
                onChange={(e) => update(i, { [name]: e.target.value })}
              />
            </Field>
          )
          return (
            <li
              key={i}
              className="grid grid-cols-2 gap-2 rounded-lg border border-graphite-200 p-2 sm:grid-cols-6 dark:border-asphalt-700"
            >
              <div className="col-span-2">
                <Field label="Measurement" htmlFor={id("key", i)}>
                  <Select
                    id={id("key", i)}
                    value={r.key}
                    disabled={!canEdit}
                    onChange={(e) => update(i, { key: e.target.value as SetupMeasurementKey })}
                  >
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
                  ) : [v, s, t].every(Number.isFinite) ? (
                    "In tolerance"
                  ) : (
                    ""
                  )}
                </span>
                {canEdit && rows.length > 1 ? (
                  <Button
                    variant="ghost"
                    size="sm"
                    onClick={() => setRows((rs) => rs.filter((_, j) => j !== i))}
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
        <Button variant="outline" size="sm" onClick={() => setRows((rs) => [...rs, emptyRow("target_height")])}>
          <Plus aria-hidden className="size-4" /> Add a measurement
        </Button>
      ) : null}
      <Field label="Scan tool result" htmlFor={id("scan")}>
        <Select
          id={id("scan")}
          value={scanResult}
          disabled={!canEdit}
          onChange={(e) => setScanResult(e.target.value as ScanResult)}
        >
          <Options values={SCAN_RESULTS} labels={SCAN_RESULT_LABEL} />
        </Select>
      </Field>
      <Field
        label="Scan tool notes"
        htmlFor={id("scan-notes")}
        hint="Codes read, the tool's own wording. Photos of the set-up and printouts go under Photos and printouts."
      >
        <Textarea
          id={id("scan-notes")}
          value={scanNotes}
          disabled={!canEdit}
          onChange={(e) => setScanNotes(e.target.value)}
        />
      </Field>
      {canEdit ? (
        <Button onClick={() => void save()} data-testid={`setup-save-${index}`}>
          Save the set-up
        </Button>
      ) : null}
      {isLead && setup?.blocksRoadTest ? (
        <div className="space-y-2 rounded-lg border border-graphite-200 p-2 dark:border-asphalt-700">
          <Field label="Lead's override: why the road test may go ahead" htmlFor={id("override")}>
            <Textarea id={id("override")} value={note} onChange={(e) => setNote(e.target.value)} />
          </Field>
          <Button variant="danger" disabled={!note.trim()} onClick={() => void override()}>
            Override with this note
          </Button>
        </div>
      ) : null}
      <FormProblem>{problem}</FormProblem>
      <FormDone>{done}</FormDone>
    </div>
  )
}
