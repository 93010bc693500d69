import type { AnyDriveFile as DriveFile } from "@/lib/drive-file/schema"
import { mpsToMph } from "@/lib/units"
import type { LeadState } from "@/lib/scoring/lead-state"
import { classifySamples, formatDecimal, isoUtc, leadStatesAt, sortMarks, type SampleRow } from "./shared"

export const SAMPLE_CSV_COLUMNS = [
  "time_utc",
  "t_ms",
  "lat_deg",
  "lon_deg",
  "speed_mps",
  "speed_mph",
  "accuracy_m",
  "lead_on",
  "gap_ft",
  "kept",
  "drop_reason",
] as const

const MARK_CSV_COLUMNS = ["time_utc", "t_ms", "kind", "gap_ft", "text"] as const

/** Every sample in time order (RFC 4180, CRLF), with whether the scorer kept it and why not. */
export function toCsv(file: DriveFile): string {
  const rows = classifySamples(file)
  const lead = leadStatesAt(
    rows.map((r) => r.sample.t),
    sortMarks(file.marks),
  )
  const lines = [SAMPLE_CSV_COLUMNS.join(",")]
  rows.forEach((r, i) => lines.push(csvSampleLine(r, lead[i]!)))
  return lines.join("\r\n") + "\r\n"
}

/** One sample's line, without its CRLF (shared with the streamed export, lib/export/stream.ts). */
export function csvSampleLine(r: SampleRow, l: LeadState): string {
  const s = r.sample
  return [
    isoUtc(s.t),
    String(s.t),
    formatDecimal(s.lat),
    formatDecimal(s.lon),
    s.speed == null ? "" : formatDecimal(s.speed),
    s.speed == null ? "" : formatDecimal(Math.round(mpsToMph(s.speed) * 1000) / 1000),
    s.accuracy == null ? "" : formatDecimal(s.accuracy),
    l.leadOn ? "true" : "false",
    l.leadOn && l.gapFt !== null ? formatDecimal(l.gapFt) : "",
    r.kept ? "true" : "false",
    r.dropReason ?? "",
  ].join(",")
}

/** The marks in time order, notes included (RFC 4180, CRLF). */
export function toMarksCsv(file: DriveFile): string {
  const lines = [MARK_CSV_COLUMNS.join(",")]
  for (const m of sortMarks(file.marks)) {
    lines.push(
      [isoUtc(m.t), String(m.t), m.kind, m.gapFt == null ? "" : formatDecimal(m.gapFt), csvField(m.text ?? "")].join(
        ",",
      ),
    )
  }
  return lines.join("\r\n") + "\r\n"
}

/** RFC 4180 quoting; text that a spreadsheet would run as a formula is prefixed with '. */
export function csvField(value: string): string {
  let v = value
  if (/^[=+\-@\t\r]/.test(v)) v = `'${v}`
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v
}

const LF = 0x0a
const CR = 0x0d
const QUOTE = 0x22

/**
 * CSV text whose writer ends lines with LF (PostgreSQL's COPY ... CSV) with RFC 4180's CRLF instead, chunk by chunk:
 * feed it the chunks in order (the quoting carries across them). A LF inside a quoted field (a name with a line
 * break) is data and stays as it is, as csvField leaves it.
 */
export function crlfLineEnds(): (chunk: Uint8Array) => Uint8Array {
  let quoted = false
  return (chunk) => {
    const ends: number[] = []
    let nextQuote = -2 // -2: not looked for yet; -1: none left in the chunk
    let nextLf = -2
    let i = 0
    while (i < chunk.length) {
      if (quoted) {
        const q = chunk.indexOf(QUOTE, i)
        if (q < 0) break
        quoted = false // a doubled quote inside the field closes and opens again, with no line end between
        i = q + 1
        continue
      }
      if (nextQuote !== -1 && nextQuote < i) nextQuote = chunk.indexOf(QUOTE, i)
      if (nextLf !== -1 && nextLf < i) nextLf = chunk.indexOf(LF, i)
      if (nextQuote >= 0 && (nextLf < 0 || nextQuote < nextLf)) {
        quoted = true // also after the chunk's last line end: the next chunk starts inside the field
        i = nextQuote + 1
        continue
      }
      if (nextLf < 0) break
      ends.push(nextLf)
      i = nextLf + 1
    }
    if (ends.length === 0) return chunk
    const out = new Uint8Array(chunk.length + ends.length)
    let from = 0
    let to = 0
    for (const lf of ends) {
      out.set(chunk.subarray(from, lf), to)
      to += lf - from
      out[to++] = CR
      from = lf // the LF goes with the next piece
    }
    out.set(chunk.subarray(from), to)
    return out
  }
}
