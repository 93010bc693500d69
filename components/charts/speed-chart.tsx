"use client"

import { CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts"

export type SpeedPoint = { min: number; mph: number | null }
export type Stretch = { fromMin: number; toMin: number }
export type ChartMark = { min: number; label: string }

/**
 * Speed over time: the qualifying band shaded amber, following stretches shaded teal, marks as labelled
 * lines. The legend says it in words too, so colour is never the only cue.
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
  const topMph = Math.max(maxSpeedMph ?? 0, ...points.map((p) => p.mph ?? 0), minSpeedMph + 10)
  const yMax = Math.ceil((topMph + 5) / 10) * 10
  const lastMin = points.at(-1)?.min ?? 1
  return (
    <figure className="space-y-2" data-testid="speed-chart">
      {/* Ink is currentColor so the line, axes and mark labels follow the light or dark theme. */}
      <div className="h-64 w-full text-graphite-800 sm:h-80 dark:text-graphite-100">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={points} margin={{ top: 16, right: 12, bottom: 4, left: -8 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="currentColor" strokeOpacity={0.2} />
            <XAxis dataKey="min" type="number" domain={[0, Math.ceil(lastMin)]} tickFormatter={(v: number) => `${v}`} unit=" min" tick={{ fontSize: 12, fill: "currentColor" }} stroke="currentColor" />
            <YAxis domain={[0, yMax]} unit=" mph" tick={{ fontSize: 12, fill: "currentColor" }} stroke="currentColor" width={64} />
            <ReferenceArea y1={minSpeedMph} y2={maxSpeedMph ?? yMax} fill="#ffbf3d" fillOpacity={0.18} ifOverflow="hidden" />
            {following.map((s, i) => (
              <ReferenceArea key={i} x1={s.fromMin} x2={s.toMin} fill="#2fcbbb" fillOpacity={0.2} ifOverflow="hidden" />
            ))}
            {marks.map((m, i) => (
              <ReferenceLine
                key={i}
                x={m.min}
                stroke="currentColor"
                strokeOpacity={0.6}
                strokeDasharray="2 3"
                label={{ value: m.label, position: i % 2 ? "insideBottomLeft" : "insideTopLeft", fontSize: 11, fill: "currentColor" }}
              />
            ))}
            <Tooltip
              contentStyle={{ color: "#1a1e23" }}
              formatter={(v) => [`${Number(v).toFixed(1)} mph`, "Speed"]}
              labelFormatter={(v) => `${Number(v).toFixed(1)} min into the drive`}
            />
            <Line type="monotone" dataKey="mph" stroke="currentColor" strokeWidth={2} dot={false} isAnimationActive={false} connectNulls={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-graphite-700 dark:text-graphite-200">
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block size-3 rounded-sm bg-signal-400/40" /> Qualifying band ({minSpeedMph}
          {maxSpeedMph ? `–${maxSpeedMph}` : "+"} mph)
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block size-3 rounded-sm bg-teal-400/40" /> Following a lead vehicle
        </span>
        <span>Dashed lines: marks</span>
      </figcaption>
    </figure>
  )
}
