import type { AnyDriveFile as DriveFile, Mark2 as Mark, Sample } from "@/lib/drive-file/schema"
import { resolveProfile } from "@/lib/drive-file/profile"
import { applyLeadMark, type LeadState } from "@/lib/scoring/lead-state"

type DropReason = "accuracy" | "duplicate-time"

export interface SampleRow {
  sample: Sample
  kept: boolean
  dropReason: DropReason | null
}

/** Rule 1 of drive-file.md, with the reason each unused sample was left out. Sorted by t (stable). */
export function classifySamples(file: DriveFile): SampleRow[] {
  const { maxAccuracyM } = resolveProfile(file.profile)
  const rows = file.samples
    .map((sample, index) => ({ sample, index }))
    .sort((a, b) => a.sample.t - b.sample.t || a.index - b.index)
  const seen = new Set<number>()
  return rows.map(({ sample }) => {
    if (sample.accuracy != null && sample.accuracy > maxAccuracyM)
      return { sample, kept: false, dropReason: "accuracy" }
    if (seen.has(sample.t)) return { sample, kept: false, dropReason: "duplicate-time" }
    seen.add(sample.t)
    return { sample, kept: true, dropReason: null }
  })
}

export function sortMarks(marks: readonly Mark[]): Mark[] {
  return marks
    .map((mark, index) => ({ mark, index }))
    .sort((a, b) => a.mark.t - b.mark.t || a.index - b.index)
    .map((x) => x.mark)
}

/** Rule 4: lead state in force at each of the given (ascending) times; marks at a time apply to it. */
export function leadStatesAt(times: readonly number[], sortedMarks: readonly Mark[]): LeadState[] {
  const state: LeadState = { leadOn: false, gapFt: null }
  let k = 0
  return times.map((t) => {
    while (k < sortedMarks.length && sortedMarks[k]!.t <= t) applyLeadMark(state, sortedMarks[k++]!)
    return { leadOn: state.leadOn, gapFt: state.gapFt }
  })
}

/** A plain decimal (never exponent notation, which xsd:decimal and many spreadsheets reject). */
export function formatDecimal(x: number, maxDigits = 9): string {
  if (!Number.isFinite(x)) throw new RangeError(`cannot write ${x} as a decimal`)
  const s = String(x)
  if (!/e/i.test(s)) return s
  return x.toFixed(maxDigits).replace(/\.?0+$/, "") || "0"
}

export function isoUtc(ms: number): string {
  return new Date(ms).toISOString()
}

export const MARK_LABELS: Record<Mark["kind"], string> = {
  "lead-on": "Lead on",
  gap: "Gap estimate",
  "lead-off": "Lead off",
  cleared: "Learn cleared",
  stopped: "Stopped",
  verified: "Verified working",
  "verify-failed": "Verify failed",
  note: "Note",
  check: "Road-test check",
}
