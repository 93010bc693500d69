import type { AnyDriveFile as DriveFile, Mark2 as Mark, Sample } from "@/lib/drive-file/schema"
import type { LeadState } from "@/lib/scoring/lead-state"
import { resolveProfile } from "@/lib/drive-file/profile"
import { MARK_LABELS, classifySamples, formatDecimal, isoUtc, leadStatesAt, sortMarks } from "./shared"

const GPX_NAMESPACE = "http://www.topografix.com/GPX/1/1"
const STRAIGHTAWAY_GPX_NAMESPACE = "https://straightaway.invalid/gpx/1"

export interface GpxMeta {
  name?: string
  description?: string
  /** Root `creator` attribute. */
  creator?: string
  /** Metadata time, ms since the epoch; default the first kept sample. */
  timeMs?: number
}

/**
 * GPX 1.1: marks as `wpt` (placed by interpolating the track at the mark's time), one `trk` with a
 * `trkseg` per stretch between data gaps. Speed (m/s), lead state and gap (ft) go in each trkpt's
 * `extensions` under our own namespace, since GPX 1.1 has no speed element.
 */
export function toGpx(file: DriveFile, meta: GpxMeta = {}): string {
  const maxGapMs = resolveProfile(file.profile).maxGapSeconds * 1000
  const kept = classifySamples(file)
    .filter((r) => r.kept)
    .map((r) => r.sample)
  const marks = sortMarks(file.marks)
  const lead = leadStatesAt(
    kept.map((s) => s.t),
    marks,
  )
  const out: string[] = []
  gpxHead(out, meta, kept[0]?.t)
  if (kept.length > 0) for (const m of marks) gpxWaypoint(out, m, positionAt(kept, m.t))
  gpxTrackHead(out, meta)
  for (let i = 0; i < kept.length; i++) {
    const s = kept[i]!
    if (i === 0) out.push("<trkseg>")
    else if (s.t - kept[i - 1]!.t > maxGapMs) out.push("</trkseg>", "<trkseg>")
    out.push(gpxTrkpt(s, lead[i]!))
  }
  gpxTail(out, kept.length > 0)
  return out.join("\n") + "\n"
}

// The pieces below are shared with the streamed export (lib/export/stream.ts); each pushes whole lines.

export function gpxHead(out: string[], meta: GpxMeta, firstKeptT: number | undefined) {
  out.push('<?xml version="1.0" encoding="UTF-8"?>')
  out.push(
    `<gpx xmlns="${GPX_NAMESPACE}" xmlns:sa="${STRAIGHTAWAY_GPX_NAMESPACE}" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" xsi:schemaLocation="${GPX_NAMESPACE} http://www.topografix.com/GPX/1/1/gpx.xsd" version="1.1" creator="${escapeXml(meta.creator ?? "Straightaway")}">`,
  )
  out.push("<metadata>")
  if (meta.name) out.push(`<name>${escapeXml(meta.name)}</name>`)
  if (meta.description) out.push(`<desc>${escapeXml(meta.description)}</desc>`)
  const metaTime = meta.timeMs ?? firstKeptT
  if (metaTime !== undefined) out.push(`<time>${isoUtc(metaTime)}</time>`)
  out.push("</metadata>")
}

export function gpxWaypoint(out: string[], m: Mark, [lat, lon]: [number, number]) {
  out.push(`<wpt lat="${formatDecimal(lat)}" lon="${formatDecimal(gpxLon(lon))}">`)
  out.push(`<time>${isoUtc(m.t)}</time>`)
  out.push(`<name>${escapeXml(MARK_LABELS[m.kind])}</name>`)
  const desc = markDescription(m)
  if (desc) out.push(`<desc>${escapeXml(desc)}</desc>`)
  out.push(`<type>${m.kind}</type>`)
  out.push("</wpt>")
}

export function gpxTrackHead(out: string[], meta: GpxMeta) {
  out.push("<trk>")
  if (meta.name) out.push(`<name>${escapeXml(meta.name)}</name>`)
  out.push("<type>calibration drive</type>")
}

export function gpxTrkpt(s: Sample, lead: LeadState): string {
  const ext: string[] = []
  if (s.speed != null) ext.push(`<sa:speedMps>${formatDecimal(s.speed)}</sa:speedMps>`)
  if (s.accuracy != null) ext.push(`<sa:accuracyM>${formatDecimal(s.accuracy)}</sa:accuracyM>`)
  ext.push(`<sa:leadOn>${lead.leadOn}</sa:leadOn>`)
  if (lead.leadOn && lead.gapFt !== null) ext.push(`<sa:gapFt>${formatDecimal(lead.gapFt)}</sa:gapFt>`)
  return `<trkpt lat="${formatDecimal(s.lat)}" lon="${formatDecimal(gpxLon(s.lon))}"><time>${isoUtc(s.t)}</time><extensions>${ext.join("")}</extensions></trkpt>`
}

export function gpxTail(out: string[], anyKept: boolean) {
  if (anyKept) out.push("</trkseg>")
  out.push("</trk>")
  out.push("</gpx>")
}

/** GPX longitudeType is -180 <= lon < 180: 180 is written as -180 (the same meridian). */
function gpxLon(lon: number): number {
  return lon >= 180 ? lon - 360 : lon
}

function markDescription(m: Mark): string | null {
  if (m.kind === "note") return m.text ?? null
  if (m.kind === "check" && m.checkKey) return `${m.checkKey}: ${m.result ?? ""}`
  if ((m.kind === "lead-on" || m.kind === "gap") && m.gapFt != null) return `Gap ${formatDecimal(m.gapFt)} ft`
  return null
}

/** Track position at a moment: linear between the samples around it, across the 180° meridian too. */
function positionAt(kept: readonly { t: number; lat: number; lon: number }[], ms: number): [number, number] {
  const first = kept[0]!
  const last = kept[kept.length - 1]!
  if (ms <= first.t) return [first.lat, first.lon]
  if (ms >= last.t) return [last.lat, last.lon]
  let lo = 0
  let hi = kept.length - 1
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1
    if (kept[mid]!.t <= ms) lo = mid
    else hi = mid
  }
  return between(kept[lo]!, kept[hi]!, ms)
}

/** The position at `ms` on the straight line from `a` to `b` (a.t <= ms < b.t), across the 180° meridian too. */
export function between(
  a: { t: number; lat: number; lon: number },
  b: { t: number; lat: number; lon: number },
  ms: number,
): [number, number] {
  const f = (ms - a.t) / (b.t - a.t)
  let dLon = b.lon - a.lon
  if (dLon > 180) dLon -= 360
  else if (dLon < -180) dLon += 360
  let lon = a.lon + f * dLon
  if (lon >= 180) lon -= 360
  else if (lon < -180) lon += 360
  return [a.lat + f * (b.lat - a.lat), lon]
}

function escapeXml(s: string): string {
  return (
    s
      .replace(/&/g, "&amp;")
      .replace(/</g, "&lt;")
      .replace(/>/g, "&gt;")
      .replace(/"/g, "&quot;")
      .replace(/'/g, "&apos;")
      // XML 1.0 section 2.2 Char: tab, LF, CR, U+0020-U+D7FF, U+E000-U+FFFD, U+10000-U+10FFFF; anything else (other
      // controls, U+FFFE, U+FFFF, a lone surrogate) makes the file not XML at all, so it is left out.
      .replace(/[^\t\n\r\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]/gu, "")
  )
}
