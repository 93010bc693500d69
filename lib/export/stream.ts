// The exports written piece by piece as the samples arrive (from a database cursor: db/queries/drive-export.ts),
// so a drive of any length is never held whole. Byte for byte the same as toGpx, toCsv and JSON.stringify of
// the whole file (tests/unit/export/stream.test.ts and tests/integration/drives/export-stream.test.ts hold them
// to it). Each generator yields a string of at most PIECE_LINES lines at a time.
import type { AnyDriveFile, Mark2 as Mark, Sample } from "@/lib/drive-file/schema"
import { resolveProfile } from "@/lib/drive-file/profile"
import { applyLeadMark, type LeadState } from "@/lib/scoring/lead-state"
import { csvSampleLine, SAMPLE_CSV_COLUMNS } from "./csv"
import { between, gpxHead, gpxTail, gpxTrackHead, gpxTrkpt, gpxWaypoint, type GpxMeta } from "./gpx"
import { sortMarks, type SampleRow } from "./shared"

/**
 * A drive file with its samples left out (`samples: []`, kept in its place so the JSON keeps the file's key
 * order): its format, kind, profile, road test and marks.
 */
export type DriveFileHead = AnyDriveFile

/**
 * Lines per yielded piece: about 60 kB of GPX, well under V8's large-object size (128 kB), so each piece and its
 * bytes die young instead of piling up in the old generation until a full collection (issue 10: a 360,000-sample
 * export measured 313 MB with 1 MB pieces).
 */
const PIECE_LINES = 256

/** Samples in ascending `t`, a chunk at a time. */
export type SampleChunks = AsyncIterable<readonly Sample[]>

/** The kept samples either side of a moment: the last at or before it and the first after it. */
export interface Around {
  before?: Sample
  after?: Sample
}

/** What the GPX needs before its first track point: the first kept sample's time and the track around each mark. */
export interface GpxLookahead {
  firstKeptT: number | undefined
  /** By mark time. */
  around: ReadonlyMap<number, Around>
}

/** Rule 1 of drive-file.md over samples that arrive in `t` order (what classifySamples does to a whole file). */
function classifier(head: DriveFileHead) {
  const { maxAccuracyM } = resolveProfile(head.profile)
  let lastKeptT: number | undefined
  return (sample: Sample): SampleRow => {
    if (sample.accuracy != null && sample.accuracy > maxAccuracyM)
      return { sample, kept: false, dropReason: "accuracy" }
    if (sample.t === lastKeptT) return { sample, kept: false, dropReason: "duplicate-time" }
    lastKeptT = sample.t
    return { sample, kept: true, dropReason: null }
  }
}

/** Rule 4 over ascending times (what leadStatesAt does to a whole list). */
function leadTracker(marks: readonly Mark[]) {
  const sorted = sortMarks(marks)
  const state: LeadState = { leadOn: false, gapFt: null }
  let k = 0
  return (t: number): LeadState => {
    while (k < sorted.length && sorted[k]!.t <= t) applyLeadMark(state, sorted[k++]!)
    return { leadOn: state.leadOn, gapFt: state.gapFt }
  }
}

/** Where the track is at `ms`, from the kept samples around it (the same answer as toGpx's search of the whole track). */
function positionFromAround({ before, after }: Around, ms: number): [number, number] {
  if (before && after) return between(before, after, ms)
  const only = before ?? after
  if (!only) throw new Error(`no kept sample around ${ms}`)
  return [only.lat, only.lon]
}

/** toGpx, streamed. */
export async function* gpxChunks(
  head: DriveFileHead,
  lookahead: GpxLookahead,
  samples: SampleChunks,
  meta: GpxMeta = {},
): AsyncGenerator<string> {
  const maxGapMs = resolveProfile(head.profile).maxGapSeconds * 1000
  const classify = classifier(head)
  const leadAt = leadTracker(head.marks)
  const out: string[] = []
  gpxHead(out, meta, lookahead.firstKeptT)
  if (lookahead.firstKeptT !== undefined) {
    for (const m of sortMarks(head.marks)) gpxWaypoint(out, m, positionFromAround(lookahead.around.get(m.t) ?? {}, m.t))
  }
  gpxTrackHead(out, meta)
  yield lines(out, "\n")
  out.length = 0
  let prevT: number | undefined
  for await (const chunk of samples) {
    for (const sample of chunk) {
      if (!classify(sample).kept) continue
      if (prevT === undefined) out.push("<trkseg>")
      else if (sample.t - prevT > maxGapMs) out.push("</trkseg>", "<trkseg>")
      prevT = sample.t
      out.push(gpxTrkpt(sample, leadAt(sample.t)))
      if (out.length >= PIECE_LINES) {
        yield lines(out, "\n")
        out.length = 0
      }
    }
  }
  gpxTail(out, prevT !== undefined)
  yield lines(out, "\n")
}

/** toCsv, streamed. */
export async function* csvChunks(head: DriveFileHead, samples: SampleChunks): AsyncGenerator<string> {
  const classify = classifier(head)
  const leadAt = leadTracker(head.marks)
  yield SAMPLE_CSV_COLUMNS.join(",") + "\r\n"
  const out: string[] = []
  for await (const chunk of samples) {
    for (const sample of chunk) {
      out.push(csvSampleLine(classify(sample), leadAt(sample.t)))
      if (out.length >= PIECE_LINES) {
        yield lines(out, "\r\n")
        out.length = 0
      }
    }
  }
  yield lines(out, "\r\n")
}

/** JSON.stringify of the whole drive file, streamed. */
export async function* driveFileChunks(head: DriveFileHead, samples: SampleChunks): AsyncGenerator<string> {
  // The file's own key order (samples before marks) comes from stringifying it with a stand-in for the samples.
  // No stored text can hold the stand-in: text with a NUL is refused before it is stored (lib/validation/storable.ts).
  const standIn = "\u0000samples\u0000"
  const whole = JSON.stringify({ ...head, samples: standIn })
  const at = whole.indexOf(JSON.stringify(standIn))
  if (at < 0 || whole.indexOf(JSON.stringify(standIn), at + 1) >= 0)
    throw new Error("the drive file's samples could not be placed")
  yield whole.slice(0, at) + "["
  let first = true
  const out: string[] = []
  const flush = () => {
    const body = (first ? "" : ",") + out.join(",")
    first = false
    out.length = 0
    return body
  }
  for await (const chunk of samples) {
    for (const sample of chunk) {
      out.push(JSON.stringify(sample))
      if (out.length >= PIECE_LINES) yield flush()
    }
  }
  yield (out.length > 0 ? flush() : "") + "]" + whole.slice(at + JSON.stringify(standIn).length)
}

/** Every line followed by the end-of-line, as `lines.join(eol) + eol` writes them. */
function lines(out: readonly string[], eol: string): string {
  return out.length === 0 ? "" : out.join(eol) + eol
}
