"use client"

import { Plus, Trash2 } from "lucide-react"
import { Button } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { Field, Input, Select, Textarea } from "@/components/ui/field"
import type { RoadTestCheck } from "@/lib/drive-file"
import { SENSOR_LABEL } from "@/lib/labels"
import { formatShown, fromDisplay, toDisplay, unitLabel, type Units } from "./profile-fields"

/**
 * A check as typed: the minimum speed as text in the shop's units (mph or km/h) so a half-typed number stays in the
 * box; an unchanged box saves the stored mph, so converting for display never drifts it.
 */
export type CheckDraft = Omit<RoadTestCheck, "minSpeedMph"> & {
  minSpeedText: string
  shownSpeedText: string
  storedMph: number | null
}

export const toDrafts = (checks: readonly RoadTestCheck[], units: Units): CheckDraft[] =>
  checks.map(({ minSpeedMph, ...c }) => {
    const text = minSpeedMph === null ? "" : formatShown(toDisplay("speed", minSpeedMph, units), "speed")
    return { ...c, minSpeedText: text, shownSpeedText: text, storedMph: minSpeedMph }
  })

export const fromDrafts = (drafts: readonly CheckDraft[], units: Units): RoadTestCheck[] =>
  drafts.map(({ minSpeedText, shownSpeedText, storedMph, ...c }) => ({
    ...c,
    label: c.label.trim(),
    minSpeedMph:
      minSpeedText === shownSpeedText
        ? storedMph
        : minSpeedText.trim() === ""
          ? null
          : fromDisplay("speed", Number(minSpeedText), units),
  }))

function keyFromLabel(label: string, taken: Set<string>): string {
  const base =
    label
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 50) || "check"
  let key = base.length >= 2 ? base : `check-${base}`
  for (let n = 2; taken.has(key); n++) key = `${base}-${n}`
  return key
}

/**
 * The road-test checks of a condition profile. The defaults are common practice, no published source; the
 * vehicle maker's service information comes first. Saving makes a new profile version, as other settings do.
 */
export function RoadTestChecksEditor({
  drafts,
  onChange,
  sensor,
  canEdit,
  errors,
  units,
}: {
  drafts: CheckDraft[]
  onChange: (next: CheckDraft[]) => void
  sensor: string | null
  canEdit: boolean
  errors: Record<string, string>
  units: Units
}) {
  const update = (i: number, patch: Partial<CheckDraft>) =>
    onChange(drafts.map((d, j) => (j === i ? { ...d, ...patch } : d)))
  const add = () => {
    const label = "New check"
    onChange([
      ...drafts,
      {
        key: keyFromLabel(label, new Set(drafts.map((d) => d.key))),
        system: (sensor as RoadTestCheck["system"]) ?? "other",
        label,
        minSpeedText: "",
        shownSpeedText: "",
        storedMph: null,
        need: "required",
      },
    ])
  }
  return (
    <Card className="space-y-3" data-testid="road-test-checks-editor">
      <div>
        <h2 className="text-lg font-semibold">Road-test checks</h2>
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          What the crew confirms on the road after the calibration. The starting list is common practice, with no
          published source: follow the vehicle maker&apos;s service information where it says more. A pass counts at the
          minimum speed or faster; leave it empty for a check at any speed.
        </p>
      </div>
      {drafts.length === 0 ? (
        <p className="text-sm">No checks: a road test with this profile has nothing to confirm for this system.</p>
      ) : null}
      <ul className="space-y-3">
        {drafts.map((d, i) => (
          <li
            key={d.key}
            className="grid gap-2 rounded-lg border border-graphite-200 p-2 sm:grid-cols-6 dark:border-asphalt-700"
          >
            <div className="sm:col-span-3">
              <Field
                label="Check"
                htmlFor={`rtc-label-${i}`}
                hint={SENSOR_LABEL[d.system] ?? d.system}
                error={errors[`roadTestChecks.${i}.label`]}
              >
                {/* Two lines on a phone: a check's words are a sentence, not a word. */}
                <Textarea
                  id={`rtc-label-${i}`}
                  rows={2}
                  className="min-h-12"
                  value={d.label}
                  disabled={!canEdit}
                  onKeyDown={(e) => e.key === "Enter" && e.preventDefault()}
                  onChange={(e) => update(i, { label: e.target.value.replace(/\s*\n\s*/g, " ") })}
                />
              </Field>
            </div>
            <Field
              label={`Minimum speed (${unitLabel("speed", units)})`}
              htmlFor={`rtc-speed-${i}`}
              error={errors[`roadTestChecks.${i}.minSpeedMph`]}
            >
              <Input
                id={`rtc-speed-${i}`}
                inputMode="decimal"
                placeholder="any"
                value={d.minSpeedText}
                disabled={!canEdit}
                onChange={(e) => update(i, { minSpeedText: e.target.value })}
              />
            </Field>
            <Field label="Needed" htmlFor={`rtc-need-${i}`}>
              <Select
                id={`rtc-need-${i}`}
                value={d.need}
                disabled={!canEdit}
                onChange={(e) => update(i, { need: e.target.value as RoadTestCheck["need"] })}
              >
                <option value="required">Required</option>
                <option value="where_equipped">Where equipped</option>
              </Select>
            </Field>
            {canEdit ? (
              <div className="flex items-end">
                <Button
                  variant="ghost"
                  size="sm"
                  aria-label={`Remove check ${i + 1}`}
                  onClick={() => onChange(drafts.filter((_, j) => j !== i))}
                >
                  <Trash2 aria-hidden className="size-4" /> Remove
                </Button>
              </div>
            ) : null}
          </li>
        ))}
      </ul>
      {canEdit ? (
        <Button variant="outline" size="sm" onClick={add}>
          <Plus aria-hidden className="size-4" /> Add a check
        </Button>
      ) : null}
    </Card>
  )
}
