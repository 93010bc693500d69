"use client"

import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts"
import { Card } from "@/components/ui/card"
import { CLEAR_BINS_MIN, clearBinLabel, everyWeek, type Numbers } from "@/lib/numbers"
import { formatDate, formatDay, formatDuration } from "@/lib/format"

// Mid tones that keep 3:1 against both the light and the dark card (WCAG 1.4.11); the legend names each one.
const PROFILE_COLOURS = ["#f5a30a", "#14a89a", "#7d8794", "#c98000", "#2fcbbb", "#aab1ba"]
const VERDICT_SERIES = [
  { key: "met", name: "Met", colour: "#14a89a" },
  { key: "short", name: "Short", colour: "#f5a30a" },
  { key: "unverified", name: "Unverified", colour: "#7d8794" },
  { key: "not_met", name: "Not met", colour: "#e5483a" },
] as const

// Legend words in the text colour (recharts paints them in the series colour, too faint to read on either theme).
const legendText = (value: string) => <span className="text-graphite-800 dark:text-graphite-100">{value}</span>
const TOOLTIP_STYLE = { color: "#1a1e23" }

export function TimeToClearChart({ data }: { data: Numbers["timeToClear"] }) {
  const profiles = data.slice(0, PROFILE_COLOURS.length)
  const rows = CLEAR_BINS_MIN.map((_, i) => ({
    bin: clearBinLabel(i),
    ...Object.fromEntries(profiles.map((p) => [p.profileName, p.bins[i] ?? 0])),
  }))
  return (
    <Card>
      <h2 className="text-lg font-semibold">Time to learn complete, by condition profile</h2>
      <p className="mb-2 text-sm text-graphite-600 dark:text-graphite-300">
        Drives per band of minutes from start to the learn-complete mark.{" "}
        {profiles
          .map((p) =>
            p.cleared
              ? `${p.profileName}: median ${formatDuration(p.medianSeconds)} (${p.cleared} of ${p.drives} completed)`
              : `${p.profileName}: none of ${p.drives} completed`,
          )
          .join(" · ")}
      </p>
      <div className="h-64 text-graphite-800 dark:text-graphite-100" data-testid="chart-time-to-clear">
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={rows} margin={{ top: 8, right: 8, bottom: 4, left: -16 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="currentColor" strokeOpacity={0.2} />
            {/* Ticks without the unit ("0-5" ... "30+"), said once under the axis: all seven fit a phone. */}
            <XAxis
              dataKey="bin"
              interval={0}
              tick={{ fontSize: 12, fill: "currentColor" }}
              tickFormatter={(v: string) => v.replace(/ min$/, "")}
              stroke="currentColor"
              height={40}
              label={{ value: "Minutes", position: "insideBottom", offset: 0, fontSize: 12, fill: "currentColor" }}
            />
            <YAxis allowDecimals={false} tick={{ fontSize: 12, fill: "currentColor" }} stroke="currentColor" />
            <Tooltip contentStyle={TOOLTIP_STYLE} />
            <Legend formatter={legendText} />
            {profiles.map((p, i) => (
              <Bar key={p.profileName} dataKey={p.profileName} fill={PROFILE_COLOURS[i]} isAnimationActive={false} />
            ))}
          </BarChart>
        </ResponsiveContainer>
      </div>
    </Card>
  )
}

export function VerdictMixChart({ data: withDrives }: { data: Numbers["verdictMix"] }) {
  const data = everyWeek(withDrives)
  // Weeks from more than one year (the 365-day range, or a range over New Year) name their year on the axis too.
  const spansYears = new Set(data.map((d) => d.weekStart.slice(0, 4))).size > 1
  const week = spansYears ? formatDate : formatDay
  return (
    <Card>
      <h2 className="text-lg font-semibold">Verdicts week by week</h2>
      <p className="mb-2 text-sm text-graphite-600 dark:text-graphite-300">
        Finished drives per week (weeks start on Monday at midnight, shop time).
      </p>
      <div className="h-64 text-graphite-800 dark:text-graphite-100" data-testid="chart-verdict-mix">
        <ResponsiveContainer width="100%" height="100%">
          {/* Labels with a year are longer: the first, angled, needs room on the left. */}
          <BarChart data={data} margin={{ top: 8, right: 8, bottom: 4, left: spansYears ? 12 : -16 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="currentColor" strokeOpacity={0.2} />
            {/* Angled week labels, every nth one evenly (recharts works out n from the width) so they never overlap. */}
            <XAxis
              dataKey="weekStart"
              interval="equidistantPreserveStart"
              minTickGap={2}
              angle={-45}
              textAnchor="end"
              height={spansYears ? 68 : 48}
              tick={{ fontSize: 12, fill: "currentColor" }}
              stroke="currentColor"
              tickFormatter={(v: string) => week(`${v}T12:00:00Z`, "UTC")}
            />
            <YAxis allowDecimals={false} tick={{ fontSize: 12, fill: "currentColor" }} stroke="currentColor" />
            <Tooltip
              contentStyle={TOOLTIP_STYLE}
              labelFormatter={(v) => `Week of ${formatDate(`${v}T12:00:00Z`, "UTC")}`}
            />
            <Legend formatter={legendText} />
            {VERDICT_SERIES.map((s) => (
              <Bar key={s.key} dataKey={s.key} name={s.name} stackId="v" fill={s.colour} isAnimationActive={false} />
            ))}
          </BarChart>
        </ResponsiveContainer>
      </div>
    </Card>
  )
}

export function TopReasonsChart({ data }: { data: Numbers["topReasons"] }) {
  return (
    <Card>
      <h2 className="text-lg font-semibold">Most common reasons</h2>
      <p className="mb-2 text-sm text-graphite-600 dark:text-graphite-300">Drives with each condition not met.</p>
      {data.length === 0 ? (
        <p>No condition was missed.</p>
      ) : (
        <div
          className="text-graphite-800 dark:text-graphite-100"
          style={{ height: Math.max(120, data.length * 44) }}
          data-testid="chart-top-reasons"
        >
          <ResponsiveContainer width="100%" height="100%">
            <BarChart data={data} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 8 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="currentColor" strokeOpacity={0.2} />
              <XAxis
                type="number"
                allowDecimals={false}
                tick={{ fontSize: 12, fill: "currentColor" }}
                stroke="currentColor"
              />
              <YAxis
                type="category"
                dataKey="label"
                width={170}
                tick={{ fontSize: 12, fill: "currentColor" }}
                stroke="currentColor"
              />
              <Tooltip contentStyle={TOOLTIP_STYLE} formatter={(v) => [`${v} drives`, "Drives"]} />
              <Bar dataKey="drives" name="Drives" fill="#7d8794" isAnimationActive={false} />
            </BarChart>
          </ResponsiveContainer>
        </div>
      )}
    </Card>
  )
}
