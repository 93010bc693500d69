"use client"
import { Ban, CircleCheck, CircleHelp, CircleX, ClipboardCheck } from "lucide-react"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import { SENSOR_LABEL } from "@/lib/labels"
import type { UnitSystem } from "@/lib/format"
import { CHECK_STATUS_LABEL, checkSpeed, checkSpeedWords } from "@/lib/road-test/words"
import type { Score } from "@/lib/scoring/types"

const STATUS_ICON = {
  passed: CircleCheck,
  failed: CircleX,
  not_equipped: Ban,
  below_speed: CircleHelp,
  not_logged: CircleHelp,
} as const

/** The finish screen's road-test part: its own verdict and every check with its result and speed. */
export function RoadTestResult({ score, units }: { score: Score; units: UnitSystem }) {
  const road = score.roadTest
  if (!road) return null
  return (
    <section
      className="space-y-3 rounded-xl bg-asphalt-800 p-3"
      aria-labelledby="road-test-result"
      data-testid="road-test-result"
    >
      <h2
        id="road-test-result"
        className="flex items-center gap-2 text-sm font-semibold tracking-wide text-graphite-300 uppercase"
      >
        <ClipboardCheck aria-hidden className="size-5 shrink-0" /> Road test
      </h2>
      <div
        className="flex flex-wrap items-center gap-x-3 gap-y-1"
        data-testid="road-test-verdict"
        data-verdict={road.verdict}
      >
        <VerdictBadge verdict={road.verdict} size="lg" />
        <span className="text-sm text-graphite-300">
          {road.passedRequired} of {road.required} required checks passed at speed
        </span>
      </div>
      <ul className="space-y-2">
        {road.checks.map((c) => {
          const Icon = STATUS_ICON[c.status]
          return (
            <li key={c.key} className="flex gap-2" data-testid={`result-${c.key}`} data-status={c.status}>
              <Icon
                aria-hidden
                className={c.blocks ? "mt-0.5 size-5 shrink-0 text-stop-400" : "mt-0.5 size-5 shrink-0 text-teal-300"}
              />
              <div>
                <p className="font-semibold">
                  {c.label}: {CHECK_STATUS_LABEL[c.status] ?? c.status}
                  {c.speedMph !== null ? ` at ${checkSpeed(c.speedMph, units)}` : ""}
                </p>
                <p className="text-sm text-graphite-300">
                  {SENSOR_LABEL[c.system] ?? c.system} · counts at {checkSpeedWords(c.minSpeedMph, units)} ·{" "}
                  {c.need === "required" ? "required" : "where equipped"}
                </p>
              </div>
            </li>
          )
        })}
      </ul>
    </section>
  )
}
