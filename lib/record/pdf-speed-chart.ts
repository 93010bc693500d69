import type { Content } from "pdfmake/interfaces"
import { resolveProfile } from "@/lib/drive-file/profile"
import { speedUnit, formatSpeedMph, type UnitSystem } from "@/lib/format"
import { mphToMps, mpsToKmh } from "@/lib/units"
import { BAND, CONTENT_W, heading, INK, LINE, MUTED, RULE } from "./pdf-kit"
import { thinTimeline } from "./timeline"
import type { RecordData } from "./types"

// Speed over time on the drive record, vector graphics (SVG drawn by pdfmake): the qualifying band shaded amber, the
// speed as a line. Kept in its own file so the record's other sections can change without touching it.

const HEIGHT = 170
const AXIS_W = 34
const SPEED_CHART_TITLE = "Speed over time"

function niceStep(span: number): number {
  const raw = span / 4
  const pow = 10 ** Math.floor(Math.log10(Math.max(raw, 1e-9)))
  for (const k of [1, 2, 5, 10]) if (k * pow >= raw) return k * pow
  return 10 * pow
}

const n = (v: number) => v.toFixed(1)
const line = (x1: number, y1: number, x2: number, y2: number, colour: string, width: number) =>
  `<line x1="${n(x1)}" y1="${n(y1)}" x2="${n(x2)}" y2="${n(y2)}" stroke="${colour}" stroke-width="${width}"/>`

/** A small label placed at (x, y) of the chart area, `width` wide; it takes no room in the flow. */
function label(text: string, x: number, y: number, width: number, alignment: "left" | "center" | "right"): Content {
  return {
    relativePosition: { x, y },
    columns: [{ width, text, fontSize: 7, color: MUTED, alignment }],
  }
}

/** The chart with its heading, kept on one page; null when the drive has too few speeds to draw. */
export function speedChart(data: RecordData, units: UnitSystem): Content | null {
  const points = thinTimeline(data.timeline, 600).filter((p) => p.speedMph != null)
  if (points.length < 2) return null
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

  const plotW = CONTENT_W - AXIS_W
  // SVG coordinates: origin at the chart's top-left, y growing downward.
  const x = (min: number) => AXIS_W + (min / totalMin) * plotW
  const y = (v: number) => HEIGHT - (Math.min(v, yMax) / yMax) * HEIGHT

  // Vector graphics as SVG (pdfmake draws it with svg-to-pdfkit); the numbers are pdfmake text beside it.
  const shapes: string[] = []
  const labels: Content[] = []
  // Qualifying band first, so the line and the grid sit on top of it.
  const bandTop = bandHigh == null ? yMax : Math.min(bandHigh, yMax)
  if (bandLow < yMax)
    shapes.push(
      `<rect x="${AXIS_W}" y="${n(y(bandTop))}" width="${plotW}" height="${n(y(bandLow) - y(bandTop))}" fill="${BAND}"/>`,
    )
  for (let v = 0; v <= yMax + 1e-9; v += yStep) {
    shapes.push(line(AXIS_W, y(v), AXIS_W + plotW, y(v), RULE, 0.4))
    labels.push(label(String(Math.round(v)), 0, y(v) - 4, AXIS_W - 6, "right"))
  }
  for (let m = 0; m <= totalMin + 1e-9; m += xStep) {
    shapes.push(line(x(m), HEIGHT, x(m), HEIGHT + 3, MUTED, 0.6))
    labels.push(label(String(Math.round(m * 10) / 10), x(m) - 15, HEIGHT + 5, 30, "center"))
  }
  shapes.push(
    `<rect x="${AXIS_W}" y="0" width="${plotW}" height="${HEIGHT}" fill="none" stroke="${RULE}" stroke-width="0.75"/>`,
  )
  const d = points.map((p, i) => `${i ? "L" : "M"}${n(x(p.tS / 60))} ${n(y(speeds[i]!))}`).join(" ")
  shapes.push(
    `<path d="${d}" fill="none" stroke="${LINE}" stroke-width="1.2" stroke-linejoin="round" stroke-linecap="round"/>`,
  )
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${CONTENT_W}" height="${HEIGHT + 4}" viewBox="0 0 ${CONTENT_W} ${HEIGHT + 4}">${shapes.join("")}</svg>`

  const band =
    bandHigh == null
      ? `${formatSpeedMph(profile.minSpeedMph, units)} or faster`
      : `${formatSpeedMph(profile.minSpeedMph, units)} to ${formatSpeedMph(profile.maxSpeedMph, units)}`
  return {
    unbreakable: true,
    stack: [
      heading(SPEED_CHART_TITLE, true),
      { text: `Speed (${unit})`, fontSize: 7, bold: true, color: MUTED, margin: [0, 0, 0, 6] },
      { stack: [...labels, { svg, width: CONTENT_W }] },
      {
        text: "Minutes into the drive",
        fontSize: 7,
        color: MUTED,
        alignment: "center",
        margin: [AXIS_W, 14, 0, 6],
      },
      {
        columns: [
          { width: 14, canvas: [{ type: "rect", x: 0, y: 1, w: 14, h: 8, color: BAND }] },
          {
            width: "*",
            text: `Shaded: the qualifying band, ${band}. Line: the phone's speed.`,
            fontSize: 8,
            color: INK,
          },
        ],
        columnGap: 4,
        margin: [0, 0, 0, 4],
      },
    ],
  }
}
