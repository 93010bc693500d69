import { rgb } from "pdf-lib"
import { resolveProfile } from "@/lib/drive-file/profile"
import { speedUnit, formatSpeedMph, type UnitSystem } from "@/lib/format"
import { mphToMps, mpsToKmh } from "@/lib/units"
import type { Writer } from "./pdf"
import { thinTimeline } from "./timeline"
import type { RecordData } from "./types"

// Speed over time on the drive record, drawn with pdf-lib: the qualifying band shaded amber, the speed as a line.
// Kept in its own file so the record's other sections can change without touching it.

const MARGIN = 50
const WIDTH = 512
const HEIGHT = 170
const AXIS_W = 34
const INK = rgb(0.1, 0.12, 0.14)
const MUTED = rgb(0.36, 0.4, 0.45)
const RULE = rgb(0.82, 0.84, 0.85)
const BAND = rgb(0.99, 0.9, 0.66)
const LINE = rgb(0.16, 0.18, 0.2)

const SPEED_CHART_TITLE = "Speed over time"

function niceStep(span: number): number {
  const raw = span / 4
  const pow = 10 ** Math.floor(Math.log10(Math.max(raw, 1e-9)))
  for (const k of [1, 2, 5, 10]) if (k * pow >= raw) return k * pow
  return 10 * pow
}

export function drawSpeedChart(w: Writer, data: RecordData, units: UnitSystem) {
  const points = thinTimeline(data.timeline, 600).filter((p) => p.speedMph != null)
  if (points.length < 2) return
  const profile = data.score.profile ?? resolveProfile(null)
  const toUnit = (mph: number) => (units === "metric" ? mpsToKmh(mphToMps(mph)) : mph)
  const unit = speedUnit(units)
  const totalMin = Math.max(points.at(-1)!.tS / 60, 1 / 60)
  const speeds = points.map((p) => toUnit(p.speedMph!))
  const bandLow = toUnit(profile.minSpeedMph)
  const bandHigh = profile.maxSpeedMph == null ? null : toUnit(profile.maxSpeedMph)
  const yStep = niceStep(Math.max(...speeds, bandHigh ?? bandLow) * 1.1)
  const yMax = Math.ceil((Math.max(...speeds, bandHigh ?? bandLow) * 1.05) / yStep) * yStep
  const xStep = niceStep(totalMin)

  w.ensure(HEIGHT + 100)
  w.heading(SPEED_CHART_TITLE)
  const top = w.y - 14
  const left = MARGIN + AXIS_W
  const plotW = WIDTH - AXIS_W
  const x = (min: number) => left + (min / totalMin) * plotW
  const y = (v: number) => top - HEIGHT + (Math.min(v, yMax) / yMax) * HEIGHT
  const page = w.page

  // Qualifying band first, so the line and the grid sit on top of it.
  const bandTop = bandHigh == null ? yMax : Math.min(bandHigh, yMax)
  if (bandLow < yMax)
    page.drawRectangle({ x: left, y: y(bandLow), width: plotW, height: y(bandTop) - y(bandLow), color: BAND })

  for (let v = 0; v <= yMax + 1e-9; v += yStep) {
    page.drawLine({ start: { x: left, y: y(v) }, end: { x: left + plotW, y: y(v) }, thickness: 0.4, color: RULE })
    page.drawText(String(Math.round(v)), { x: MARGIN, y: y(v) - 3, size: 7, font: w.font, color: MUTED })
  }
  for (let m = 0; m <= totalMin + 1e-9; m += xStep) {
    page.drawLine({
      start: { x: x(m), y: top - HEIGHT },
      end: { x: x(m), y: top - HEIGHT - 3 },
      thickness: 0.6,
      color: MUTED,
    })
    page.drawText(String(Math.round(m * 10) / 10), {
      x: x(m) - 4,
      y: top - HEIGHT - 12,
      size: 7,
      font: w.font,
      color: MUTED,
    })
  }
  page.drawRectangle({ x: left, y: top - HEIGHT, width: plotW, height: HEIGHT, borderColor: RULE, borderWidth: 0.75 })

  const d = points
    .map((p, i) => `${i ? "L" : "M"}${(x(p.tS / 60) - left).toFixed(1)} ${(top - y(toUnit(p.speedMph!))).toFixed(1)}`)
    .join(" ")
  // drawSvgPath's origin is (x, y) with y growing downward.
  page.drawSvgPath(d, { x: left, y: top, borderColor: LINE, borderWidth: 1.2 })

  page.drawText(`Speed (${unit})`, { x: MARGIN, y: top + 4, size: 7, font: w.bold, color: MUTED })
  w.y = top - HEIGHT - 16
  w.text("Minutes into the drive", { size: 7, color: MUTED, x: left + plotW / 2 - 35, gap: 4 })
  const band =
    bandHigh == null
      ? `${formatSpeedMph(profile.minSpeedMph, units)} or faster`
      : `${formatSpeedMph(profile.minSpeedMph, units)} to ${formatSpeedMph(profile.maxSpeedMph, units)}`
  w.page.drawRectangle({ x: MARGIN, y: w.y - 9, width: 14, height: 8, color: BAND })
  w.text(`Shaded: the qualifying band, ${band}. Line: the phone's speed.`, { size: 8, color: INK, x: MARGIN + 18 })
}
