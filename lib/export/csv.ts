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
