"use client"

import { MARK_ICON } from "@/components/drives/mark-icon"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { formatDuration, formatSpeedMph, speedUnit } from "@/lib/format"
import { useState } from "react"
import {
  CartesianGrid,
  ComposedChart,
  Line,
  ReferenceArea,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts"

export type SpeedPoint = { min: number; mph: number | null }
export type Stretch = { fromMin: number; toMin: number }
export type ChartMark = { min: number; label: string; kind?: string }

const BADGE_PX = 18 // a numbered mark badge: 16 px circle plus a hair of air
const LANE_PX = 19
const MAX_LANES = 4
const Y_AXIS_PX = 64
const MARGIN = { right: 12, left: -8 }

/**
 * Marks close together in time would print their names on top of each other, so each mark is a numbered
 * badge, stacked into the next row up when it would touch its neighbour, and the numbers are spelled out
 * (icon, word, time) under the chart. Shape and number identify a mark; colour never has to.
 */
function laneMarks(marks: readonly ChartMark[], domainMin: number, plotWidthPx: number) {
  const pxPerMin = plotWidthPx / Math.max(domainMin, 1e-9)
  const lastX: number[] = []
  const placed = [...marks]
    .map((m, i) => ({ ...m, i }))
    .sort((a, b) => a.min - b.min || a.i - b.i)
    .map((m, n) => {
      const x = m.min * pxPerMin
      let lane = lastX.findIndex((last) => x - last >= BADGE_PX)
      if (lane === -1) lane = lastX.length < MAX_LANES ? lastX.length : lastX.indexOf(Math.min(...lastX))
      lastX[lane] = x
      return { ...m, n: n + 1, lane }
    })
  return { placed, lanes: Math.max(1, lastX.length) }
}

function formatAt(min: number) {
  return formatDuration(Math.max(0, min) * 60)
}

/**
 * Speed over time: the qualifying band shaded amber, following stretches shaded teal, marks as numbered
 * dashed lines. The legend says it in words too, so colour is never the only cue.
 */
export function SpeedChart({
  points,
  minSpeedMph,
  maxSpeedMph,
  following,
  marks,
}: {
  points: SpeedPoint[]
  minSpeedMph: number
  maxSpeedMph: number | null
  following: Stretch[]
  marks: ChartMark[]
}) {
  const [widthPx, setWidthPx] = useState(340)
  // The shop's unit: 1 mph = 1.609344 km/h exactly (NIST SP 811: 1 mi = 1609.344 m).
  const { units } = useFormatPrefs()
  const k = units === "metric" ? 1.609344 : 1
  const unit = speedUnit(units)
  const shown = points.map((p) => ({ min: p.min, speed: p.mph == null ? null : Math.round(p.mph * k * 10) / 10 }))
  const topMph = Math.max(maxSpeedMph ?? 0, ...points.map((p) => p.mph ?? 0), minSpeedMph + 10)
  const yMax = Math.ceil((topMph * k + 5) / 10) * 10
  const lastMin = points.at(-1)?.min ?? 1
  const domainMax = Math.max(1, Math.ceil(Math.max(lastMin, ...marks.map((m) => m.min))))
  const plotWidthPx = Math.max(120, widthPx - Y_AXIS_PX - MARGIN.right - MARGIN.left)
  const { placed, lanes } = laneMarks(marks, domainMax, plotWidthPx)
  const top = marks.length ? 8 + lanes * LANE_PX : 16
  return (
    <figure className="space-y-2" data-testid="speed-chart">
      {/* Ink is currentColor so the line, axes and mark badges follow the light or dark theme. */}
      <div className="h-64 w-full text-graphite-800 sm:h-80 dark:text-graphite-100">
        <ResponsiveContainer width="100%" height="100%" onResize={(w) => setWidthPx(w)}>
          <ComposedChart data={shown} margin={{ top, bottom: 4, ...MARGIN }}>
            <CartesianGrid strokeDasharray="3 3" stroke="currentColor" strokeOpacity={0.2} />
            <XAxis
              dataKey="min"
              type="number"
              domain={[0, domainMax]}
              tickFormatter={(v: number) => `${v}`}
              unit=" min"
              tick={{ fontSize: 12, fill: "currentColor" }}
              stroke="currentColor"
            />
            <YAxis
              domain={[0, yMax]}
              unit={` ${unit}`}
              tick={{ fontSize: 12, fill: "currentColor" }}
              stroke="currentColor"
              width={Y_AXIS_PX}
            />
            <ReferenceArea
              y1={minSpeedMph * k}
              y2={maxSpeedMph == null ? yMax : maxSpeedMph * k}
              fill="#ffbf3d"
              fillOpacity={0.18}
              ifOverflow="hidden"
            />
            {following.map((s, i) => (
              <ReferenceArea key={i} x1={s.fromMin} x2={s.toMin} fill="#2fcbbb" fillOpacity={0.2} ifOverflow="hidden" />
            ))}
            {placed.map((m) => (
              <ReferenceLine
                key={m.n}
                x={m.min}
                stroke="currentColor"
                strokeOpacity={0.6}
                strokeDasharray="2 3"
                label={(props: { viewBox?: { x?: number; y?: number } }) => (
                  <MarkBadge n={m.n} lane={m.lane} lanes={lanes} x={props.viewBox?.x ?? 0} y={props.viewBox?.y ?? 0} />
                )}
              />
            ))}
            <Tooltip
              contentStyle={{ color: "#1a1e23" }}
              formatter={(v) => [`${Math.round(Number(v))} ${unit}`, "Speed"]}
              labelFormatter={(v) => `${formatAt(Number(v))} into the drive`}
            />
            <Line
              type="monotone"
              dataKey="speed"
              stroke="currentColor"
              strokeWidth={2}
              dot={false}
              isAnimationActive={false}
              connectNulls={false}
            />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="space-y-2 text-sm text-graphite-700 dark:text-graphite-200">
        <div className="flex flex-wrap gap-x-4 gap-y-1">
          <span className="inline-flex items-center gap-1.5">
            <span aria-hidden className="inline-block size-3 rounded-sm bg-signal-400/40" /> Qualifying band (
            {maxSpeedMph == null
              ? `${formatSpeedMph(minSpeedMph, units)} or faster`
              : `${formatSpeedMph(minSpeedMph, units)} to ${formatSpeedMph(maxSpeedMph, units)}`}
            )
          </span>
          <span className="inline-flex items-center gap-1.5">
            <span aria-hidden className="inline-block size-3 rounded-sm bg-teal-400/40" /> Following a lead vehicle
          </span>
          {placed.length ? <span>Numbered dashed lines: marks, listed below</span> : null}
        </div>
        {placed.length ? (
          <ol
            className="grid grid-cols-[repeat(auto-fill,minmax(9.5rem,1fr))] gap-x-4 gap-y-1"
            data-testid="chart-marks"
          >
            {placed.map((m) => {
              const Icon = MARK_ICON[m.kind ?? ""] ?? MARK_ICON.note!
              return (
                <li key={m.n} className="flex items-center gap-1.5" data-kind={m.kind}>
                  <span
                    aria-hidden
                    className="inline-flex size-5 shrink-0 items-center justify-center rounded-full border border-current tabular text-xs font-bold"
                  >
                    {m.n}
                  </span>
                  <Icon aria-hidden className="size-4 shrink-0" />
                  <span>
                    <span className="sr-only">Mark {m.n}: </span>
                    {m.label}{" "}
                    <span className="tabular text-graphite-600 dark:text-graphite-300">{formatAt(m.min)}</span>
                  </span>
                </li>
              )
            })}
          </ol>
        ) : null}
      </figcaption>
    </figure>
  )
}

/** A mark's number in a ring above the plot, one row per lane, with a tick down to its line. */
function MarkBadge({ n, lane, lanes, x, y }: { n: number; lane: number; lanes: number; x: number; y: number }) {
  const cy = y - 4 - (lanes - lane - 0.5) * LANE_PX
  return (
    <g aria-hidden>
      <line x1={x} x2={x} y1={cy + 8} y2={y} stroke="currentColor" strokeOpacity={0.6} strokeDasharray="2 3" />
      <circle
        cx={x}
        cy={cy}
        r={8}
        className="fill-white dark:fill-asphalt-800"
        stroke="currentColor"
        strokeWidth={1.25}
      />
      <text
        x={x}
        y={cy}
        textAnchor="middle"
        dominantBaseline="central"
        fontSize={10}
        fontWeight={700}
        fill="currentColor"
      >
        {n}
      </text>
    </g>
  )
}
