// A sealed drive: a mark belongs to the drive only when its time falls inside it, from 2 min before the first
// position to 2 min after the finish (the later of the Finish request and the last position). While the drive
// is being recorded there is no end yet; before any position arrives there is no start yet.
export const MARK_MARGIN_MS = 2 * 60_000

export interface DriveSpan {
  firstSampleT: number | null
  lastSampleT: number | null
  /** When Finish was first requested (server time), or null while recording. */
  finishedAtMs: number | null
}

export function markWindow(span: DriveSpan): { fromMs: number | null; toMs: number | null } {
  const fromMs = span.firstSampleT === null ? null : span.firstSampleT - MARK_MARGIN_MS
  const toMs =
    span.finishedAtMs === null ? null : Math.max(span.finishedAtMs, span.lastSampleT ?? -Infinity) + MARK_MARGIN_MS
  return { fromMs, toMs }
}

function minutes(ms: number) {
  const m = ms / 60_000
  return m < 10 ? `${Math.round(m * 10) / 10}` : `${Math.round(m)}`
}

/** `marks.<i>.t` -> the problem, for every mark outside the drive; empty when all fit. */
export function marksOutsideDrive(marks: ReadonlyArray<{ t: number }>, span: DriveSpan): Record<string, string> {
  const { fromMs, toMs } = markWindow(span)
  const fields: Record<string, string> = {}
  marks.forEach((m, i) => {
    if (fromMs !== null && m.t < fromMs) {
      fields[`marks.${i}.t`] =
        `is ${minutes(fromMs + MARK_MARGIN_MS - m.t)} min before the drive's first position; a mark must fall within the drive (up to 2 min before its start)`
    } else if (toMs !== null && m.t > toMs) {
      fields[`marks.${i}.t`] =
        `is ${minutes(m.t - (toMs - MARK_MARGIN_MS))} min after the drive finished; a mark must fall within the drive (up to 2 min after its finish)`
    }
  })
  return fields
}
