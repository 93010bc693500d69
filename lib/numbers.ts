// The shop's numbers, from plain rows: pure aggregation, no I/O. Times are seconds in and whole seconds out
// (lib/format wholeSeconds: the same rounding formatDuration shows); weeks are the shop's calendar weeks.
import { csvField } from "@/lib/export/csv"
import { isoDay, isoLocalDateTime, wholeSeconds } from "@/lib/format"
import type { Verdict } from "@/lib/scoring/types"

export interface NumbersDrive {
  driveId: string
  finishedAt: string
  verdict: Verdict
  profileName: string
  technicianId: string
  technicianName: string
  /** From the first kept sample to the cleared mark; null when the learn never cleared. */
  clearedAtSeconds: number | null
  durationSeconds: number
  qualifyingSecondsBeforeClear: number
  followingSecondsBeforeClear: number
  harshEvents: number
  /** Keys of the conditions that were not met (the score's conditions). */
  unmetConditions: string[]
  reviewStatus: "approved" | "redo" | null
}

/** A drive as the database lists it for the numbers (db/queries/numbers.ts listDrivesForNumbers). */
export interface NumbersDriveRow {
  public_id: string
  finished_at: Date | string | null
  verdict: string | null
  profile_name: string | null
  driver_id: string
  driver_name: string | null
  cleared_at_seconds: number | string | null
  duration_seconds: number | string | null
  qualifying_seconds: number | string | null
  following_seconds: number | string | null
  harsh_events: number | string | null
  unmet_conditions: string[] | null
  review_status: "approved" | "redo" | null
}

/** A listed row as the numbers read it: names for people and profiles gone since, numbers from their text. */
export function numbersDriveFromRow(r: NumbersDriveRow): NumbersDrive {
  return {
    driveId: r.public_id,
    finishedAt: new Date(r.finished_at ?? 0).toISOString(),
    verdict: (r.verdict ?? "not_met") as Verdict,
    profileName: r.profile_name ?? "Profile set on the drive",
    technicianId: r.driver_id,
    technicianName: r.driver_name ?? "Former staff",
    clearedAtSeconds: r.cleared_at_seconds == null ? null : Number(r.cleared_at_seconds),
    durationSeconds: Number(r.duration_seconds),
    qualifyingSecondsBeforeClear: Number(r.qualifying_seconds),
    followingSecondsBeforeClear: Number(r.following_seconds),
    harshEvents: Number(r.harsh_events),
    unmetConditions: r.unmet_conditions ?? [],
    reviewStatus: r.review_status,
  }
}

export const CONDITION_PROBLEM: Record<string, string> = {
  cleared: "Learn never reported complete",
  "time-limit": "Timed out",
  "qualifying-time": "Too little qualifying time",
  "following-time": "Too little following time",
  verified: "Function not seen working",
  "harsh-events": "Harsh braking or acceleration",
  "data-gaps": "Position data gaps",
}

/**
 * Percentile by linear interpolation between closest ranks, the "C = 1" variant (Hyndman & Fan 1996
 * definition 7; the default of R, NumPy and spreadsheet PERCENTILE.INC). p in [0, 100].
 */
export function percentile(values: readonly number[], p: number): number | null {
  if (values.length === 0) return null
  const sorted = [...values].sort((a, b) => a - b)
  const x = (p / 100) * (sorted.length - 1)
  const lo = Math.floor(x)
  const hi = Math.min(lo + 1, sorted.length - 1)
  return sorted[lo]! + (x - lo) * (sorted[hi]! - sorted[lo]!)
}

/** Bins of minutes to clear: [0,5), [5,10) ... [30, ∞). */
export const CLEAR_BINS_MIN = [0, 5, 10, 15, 20, 25, 30] as const

export function clearBinLabel(i: number) {
  const lo = CLEAR_BINS_MIN[i]!
  const hi = CLEAR_BINS_MIN[i + 1]
  return hi === undefined ? `${lo}+ min` : `${lo}-${hi} min`
}

export interface TimeToClear {
  profileName: string
  drives: number
  cleared: number
  /** Whole seconds from start to the learn-complete mark (rounded down, as formatDuration shows them). */
  medianSeconds: number | null
  p90Seconds: number | null
  /** Count of cleared drives per CLEAR_BINS_MIN bin. */
  bins: number[]
}

export function timeToClearByProfile(drives: readonly NumbersDrive[]): TimeToClear[] {
  const groups = groupBy(drives, (d) => d.profileName)
  return [...groups.entries()]
    .map(([profileName, list]) => {
      const seconds = list.filter((d) => d.clearedAtSeconds != null).map((d) => d.clearedAtSeconds!)
      const bins = CLEAR_BINS_MIN.map(() => 0)
      for (const s of seconds) {
        let i = CLEAR_BINS_MIN.length - 1
        while (i > 0 && s < CLEAR_BINS_MIN[i]! * 60) i--
        bins[i]! += 1
      }
      return {
        profileName,
        drives: list.length,
        cleared: seconds.length,
        medianSeconds: wholeSeconds(percentile(seconds, 50)),
        p90Seconds: wholeSeconds(percentile(seconds, 90)),
        bins,
      }
    })
    .sort((a, b) => b.drives - a.drives || a.profileName.localeCompare(b.profileName))
}

/** Monday of the ISO 8601 week holding the instant on the calendar of `timeZone` (the shop's), as YYYY-MM-DD. */
export function isoWeekStart(iso: string, timeZone: string): string {
  const [y, m, day] = isoDay(iso, timeZone).split("-").map(Number)
  const local = new Date(Date.UTC(y!, m! - 1, day!)) // the shop's calendar day, as a date without a zone
  const back = (local.getUTCDay() + 6) % 7 // Monday = 0 (ISO 8601 numbers Monday as day 1)
  return new Date(Date.UTC(y!, m! - 1, day! - back)).toISOString().slice(0, 10)
}

export type VerdictMixRow = { weekStart: string; total: number } & Record<Verdict, number>

export function verdictMixByWeek(drives: readonly NumbersDrive[], timeZone: string): VerdictMixRow[] {
  const rows = new Map<string, VerdictMixRow>()
  for (const d of drives) {
    const weekStart = isoWeekStart(d.finishedAt, timeZone)
    const row = rows.get(weekStart) ?? { weekStart, total: 0, met: 0, short: 0, not_met: 0, unverified: 0 }
    row[d.verdict] += 1
    row.total += 1
    rows.set(weekStart, row)
  }
  return [...rows.values()].sort((a, b) => a.weekStart.localeCompare(b.weekStart))
}

/**
 * The weeks from the first row's to the last's, each one there: a week without finished drives is a row of zeros, so
 * a chart of them spaces time evenly (weeks start on Monday, as YYYY-MM-DD; counted on the calendar, no zone).
 */
export function everyWeek(rows: readonly VerdictMixRow[]): VerdictMixRow[] {
  if (rows.length === 0) return []
  const byWeek = new Map(rows.map((r) => [r.weekStart, r]))
  const sorted = [...byWeek.keys()].sort()
  const out: VerdictMixRow[] = []
  const last = Date.parse(`${sorted.at(-1)}T00:00:00Z`)
  for (let at = Date.parse(`${sorted[0]}T00:00:00Z`); at <= last; at += 7 * 86_400_000) {
    const weekStart = new Date(at).toISOString().slice(0, 10)
    out.push(byWeek.get(weekStart) ?? { weekStart, total: 0, met: 0, short: 0, not_met: 0, unverified: 0 })
  }
  return out
}

export type ReasonCount = { key: string; label: string; drives: number; share: number }

export function topReasons(drives: readonly NumbersDrive[], limit = 7): ReasonCount[] {
  const counts = new Map<string, number>()
  for (const d of drives) for (const key of new Set(d.unmetConditions)) counts.set(key, (counts.get(key) ?? 0) + 1)
  return [...counts.entries()]
    .map(([key, n]) => ({
      key,
      label: CONDITION_PROBLEM[key] ?? key,
      drives: n,
      share: drives.length ? n / drives.length : 0,
    }))
    .sort((a, b) => b.drives - a.drives || a.key.localeCompare(b.key))
    .slice(0, limit)
}

export type TechnicianNumbers = {
  technicianId: string
  name: string
  drives: number
  met: number
  metShare: number
  /** Whole seconds (rounded down). */
  medianSecondsToClear: number | null
  harshEvents: number
  sentBack: number
}

export function perTechnician(drives: readonly NumbersDrive[]): TechnicianNumbers[] {
  return [...groupBy(drives, (d) => d.technicianId).entries()]
    .map(([technicianId, list]) => {
      const met = list.filter((d) => d.verdict === "met").length
      return {
        technicianId,
        name: list[0]!.technicianName,
        drives: list.length,
        met,
        metShare: met / list.length,
        medianSecondsToClear: wholeSeconds(
          percentile(
            list.filter((d) => d.clearedAtSeconds != null).map((d) => d.clearedAtSeconds!),
            50,
          ),
        ),
        harshEvents: list.reduce((n, d) => n + d.harshEvents, 0),
        sentBack: list.filter((d) => d.reviewStatus === "redo").length,
      }
    })
    .sort((a, b) => b.drives - a.drives || a.name.localeCompare(b.name))
}

/** `timeZone`: the shop's; weeks begin on its Mondays at midnight. */
export function computeNumbers(drives: readonly NumbersDrive[], timeZone: string) {
  return {
    drives: drives.length,
    timeToClear: timeToClearByProfile(drives),
    verdictMix: verdictMixByWeek(drives, timeZone),
    topReasons: topReasons(drives),
    perTechnician: perTechnician(drives),
  }
}
export type Numbers = ReturnType<typeof computeNumbers>

const NUMBERS_CSV_COLUMNS = [
  "drive_id",
  "finished_at",
  "technician",
  "profile",
  "verdict",
  "time_to_learn_complete_seconds",
  "qualifying_time_before_learn_complete_seconds",
  "following_time_before_learn_complete_seconds",
  "drive_time_seconds",
  "harsh_events",
  "review",
  "unmet_conditions",
] as const

/**
 * One line per drive (RFC 4180, CRLF), for a spreadsheet. Times of day are ISO 8601 in the shop's zone with
 * its UTC offset; durations are whole seconds rounded down (the same figure formatDuration writes on the pages),
 * and each duration's header ends in `_seconds`. The download itself is written by PostgreSQL (db/queries/numbers.ts
 * openNumbersCsv, COPY): this is its definition, which tests hold it to byte for byte; change both together.
 */
export function numbersToCsv(drives: readonly NumbersDrive[], timeZone: string): string {
  const lines = [NUMBERS_CSV_COLUMNS.join(",")]
  for (const d of drives) {
    lines.push(
      [
        d.driveId,
        isoLocalDateTime(d.finishedAt, timeZone),
        csvField(d.technicianName),
        csvField(d.profileName),
        d.verdict,
        d.clearedAtSeconds == null ? "" : String(wholeSeconds(d.clearedAtSeconds)),
        String(wholeSeconds(d.qualifyingSecondsBeforeClear)),
        String(wholeSeconds(d.followingSecondsBeforeClear)),
        String(wholeSeconds(d.durationSeconds)),
        String(d.harshEvents),
        d.reviewStatus ?? "",
        csvField(d.unmetConditions.join(" ")),
      ].join(","),
    )
  }
  return lines.join("\r\n") + "\r\n"
}

function groupBy<T>(list: readonly T[], key: (t: T) => string) {
  const map = new Map<string, T[]>()
  for (const item of list) {
    const k = key(item)
    const group = map.get(k)
    if (group) group.push(item)
    else map.set(k, [item])
  }
  return map
}
