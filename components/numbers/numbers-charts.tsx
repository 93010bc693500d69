"use client"

import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts"
import { Card } from "@/components/ui/card"
import { CLEAR_BINS_MIN, clearBinLabel, type Numbers } from "@/lib/numbers"

const PROFILE_COLOURS = ["#f5a30a", "#14a89a", "#48515c", "#8f5b00", "#0b5f58", "#aab1ba"]
const VERDICT_SERIES = [
  { key: "met", name: "Met", colour: "#14a89a" },
  { key: "short", name: "Short", colour: "#f5a30a" },
  { key: "unverified", name: "Unverified", colour: "#7d8794" },
  { key: "not_met", name: "Not met", colour: "#b8342a" },
] as const

export function TimeToClearChart({ data }: { data: Numbers["timeToClear"] }) {
  const profiles = data.slice(0, PROFILE_COLOURS.length)
  const rows = CLEAR_BINS_MIN.map((_, i) => ({
    bin: clearBinLabel(i),
    ...Object.fromEntries(profiles.map((p) => [p.profileName, p.bins[i] ?? 0])),
  }))
  return (
    <Card>
      <h2 className="text-lg font-semibold">Time to clear, by condition profile</h2>
      <p className="mb-2 text-sm text-graphite-600 dark:text-graphite-300">
        Drives per band of minutes from start to the cleared mark. {profiles.map((p) => (p.cleared ? `${p.profileName}: median ${p.medianMinutes} min (${p.cleared} of ${p.drives} cleared)` : `${p.profileName}: none of ${p.drives} cleared`)).join(" · ")}
      </p>
      <div className="h-64" data-testid="chart-time-to-clear">
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={rows} margin={{ top: 8, right: 8, bottom: 4, left: -16 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="#d0d4d9" />
            <XAxis dataKey="bin" tick={{ fontSize: 12 }} />
            <YAxis allowDecimals={false} tick={{ fontSize: 12 }} />
            <Tooltip />
            <Legend />
            {profiles.map((p, i) => (
              <Bar key={p.profileName} dataKey={p.profileName} fill={PROFILE_COLOURS[i]} isAnimationActive={false} />
            ))}
          </BarChart>
        </ResponsiveContainer>
      </div>
    </Card>
  )
}

export function VerdictMixChart({ data }: { data: Numbers["verdictMix"] }) {
  return (
    <Card>
      <h2 className="text-lg font-semibold">Verdicts week by week</h2>
      <p className="mb-2 text-sm text-graphite-600 dark:text-graphite-300">Finished drives per week (weeks start on Monday).</p>
      <div className="h-64" data-testid="chart-verdict-mix">
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} margin={{ top: 8, right: 8, bottom: 4, left: -16 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="#d0d4d9" />
            <XAxis dataKey="weekStart" tick={{ fontSize: 12 }} tickFormatter={(v: string) => v.slice(5)} />
            <YAxis allowDecimals={false} tick={{ fontSize: 12 }} />
            <Tooltip labelFormatter={(v) => `Week of ${v}`} />
            <Legend />
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
        <div style={{ height: Math.max(120, data.length * 44) }} data-testid="chart-top-reasons">
          <ResponsiveContainer width="100%" height="100%">
            <BarChart data={data} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 8 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#d0d4d9" />
              <XAxis type="number" allowDecimals={false} tick={{ fontSize: 12 }} />
              <YAxis type="category" dataKey="label" width={170} tick={{ fontSize: 12 }} />
              <Tooltip formatter={(v) => [`${v} drives`, "Drives"]} />
              <Bar dataKey="drives" name="Drives" fill="#48515c" isAnimationActive={false} />
            </BarChart>
          </ResponsiveContainer>
        </div>
      )}
    </Card>
  )
}
