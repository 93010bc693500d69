import { CircleCheck, CircleMinus, CircleX } from "lucide-react"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import { Bullets } from "@/components/ui/bullets"
import { Card } from "@/components/ui/card"
import { cn } from "@/components/ui/cn"
import type { Score } from "@/lib/scoring"
import { formatDistance, formatDuration, formatSpeedMph, plural, type UnitSystem } from "@/lib/format"
import { describeConditions, describeReasons, formatAgainst, type ConditionLine } from "@/lib/format/conditions"

/** The verdict with its reasons, the key figures and every condition with value and requirement. */
export function RecordSummary({
  score,
  meaning,
  className,
  units = "imperial",
}: {
  score: Score
  meaning?: string
  className?: string
  units?: UnitSystem
}) {
  const verified = score.conditions.find((c) => c.key === "verified")
  const lines = describeConditions(score, units)
  const { reasons, notes } = describeReasons(score, units)
  const figures: Array<[string, string]> = [
    [
      "Qualifying before the learn completed",
      formatAgainst(score.qualifyingSecondsBeforeClear, (score.profile?.minQualifyingMinutes ?? 10) * 60),
    ],
    [
      "Following before the learn completed",
      formatAgainst(score.followingSecondsBeforeClear, (score.profile?.minFollowingMinutes ?? 2) * 60),
    ],
    ["Distance", formatDistance(score.distanceMeters, units)],
    ["Duration", formatDuration(score.durationSeconds)],
    [
      "Harsh events (advisory)",
      score.harshEvents.decel + score.harshEvents.accel === 0
        ? "None"
        : `${plural(score.harshEvents.decel, "hard braking", "hard braking")} · ${plural(score.harshEvents.accel, "hard acceleration", "hard acceleration")}`,
    ],
    ["Function check", verified?.met ? `Seen working at ${formatSpeedMph(verified.value, units)}` : "Not shown"],
  ]
  return (
    <div className={cn("space-y-4", className)}>
      <Card className="space-y-3">
        <div className="flex flex-wrap items-center gap-3">
          <VerdictBadge verdict={score.verdict} size="lg" />
          {score.clearedAtSeconds != null ? (
            <span className="text-sm text-graphite-600 dark:text-graphite-300">
              Learn reported complete {formatDuration(score.clearedAtSeconds)} into the drive
            </span>
          ) : null}
        </div>
        {meaning ? <p className="font-medium">{meaning}</p> : null}
        {reasons.length ? (
          <Bullets className="list-disc space-y-1 pl-5" testId="verdict-reasons" items={reasons} />
        ) : (
          <p>Every condition the verdict rests on was met.</p>
        )}
        {notes.length ? (
          <ul className="space-y-1 text-sm text-graphite-600 dark:text-graphite-300">
            {notes.map((n) => (
              <li key={n}>Note: {n}</li>
            ))}
          </ul>
        ) : null}
      </Card>
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-3">
        {figures.map(([label, value]) => (
          <Card key={label} className="p-3">
            <dt className="text-sm text-graphite-600 dark:text-graphite-300">{label}</dt>
            <dd className="tabular text-xl font-bold">{value}</dd>
          </Card>
        ))}
      </dl>
      <Card className="p-0">
        <h3 className="px-3 pt-3 font-semibold">Every condition</h3>
        {/* A list, not a table: four columns do not fit a phone, and each line reads on its own. */}
        <ul className="divide-y divide-graphite-100 dark:divide-asphalt-700" data-testid="conditions">
          {lines.map((c) => (
            <li key={c.key} className="flex items-start justify-between gap-3 px-3 py-2.5" data-condition={c.key}>
              <div className="min-w-0">
                <p className="font-medium">{c.label}</p>
                <p className="tabular text-sm text-graphite-600 dark:text-graphite-300">
                  {c.value}
                  {c.requirement ? ` · ${c.requirement}` : ""}
                </p>
              </div>
              <ConditionState condition={c} />
            </li>
          ))}
        </ul>
      </Card>
    </div>
  )
}

function ConditionState({ condition: c }: { condition: ConditionLine }) {
  if (c.state === "met")
    return (
      <span className="inline-flex shrink-0 items-center gap-1 font-semibold text-teal-700 dark:text-teal-300">
        <CircleCheck aria-hidden className="size-4" /> Met
      </span>
    )
  if (c.advisory)
    return (
      <span className="inline-flex shrink-0 items-center gap-1 font-semibold text-signal-700 dark:text-signal-300">
        <CircleMinus aria-hidden className="size-4" /> Note
      </span>
    )
  return (
    <span className="inline-flex shrink-0 items-center gap-1 font-semibold text-stop-600 dark:text-stop-400">
      <CircleX aria-hidden className="size-4" /> Not met
    </span>
  )
}
