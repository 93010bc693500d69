import { CircleCheck, CircleMinus, CircleX } from "lucide-react"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import { Card } from "@/components/ui/card"
import type { Condition, Score } from "@/lib/scoring"
import { formatConditionRequirement, formatConditionValue, formatDuration, formatMiles, formatMinutes } from "@/lib/record"


/** The verdict with its reasons, the key figures and every condition with value and requirement. */
export function RecordSummary({ score }: { score: Score }) {
  const verified = score.conditions.find((c) => c.key === "verified")
  const figures: Array<[string, string]> = [
    ["Qualifying before the clear", `${formatMinutes(score.qualifyingSecondsBeforeClear, (score.profile?.minQualifyingMinutes ?? 10) * 60)} min`],
    ["Following before the clear", `${formatMinutes(score.followingSecondsBeforeClear, (score.profile?.minFollowingMinutes ?? 2) * 60)} min`],
    ["Distance", `${formatMiles(score.distanceMeters)} mi`],
    ["Duration", formatDuration(score.durationSeconds)],
    ["Harsh events", `${score.harshEvents.decel} braking · ${score.harshEvents.accel} accel.`],
    ["Function check", verified?.met ? `Seen working at ${verified.value} mph` : "Not shown"],
  ]
  return (
    <div className="space-y-4">
      <Card className="space-y-3">
        <div className="flex flex-wrap items-center gap-3">
          <VerdictBadge verdict={score.verdict} size="lg" />
          {score.clearedAtSeconds != null ? (
            <span className="text-sm text-graphite-600 dark:text-graphite-300">Cleared {formatDuration(score.clearedAtSeconds)} into the drive</span>
          ) : null}
        </div>
        {score.reasons.length ? (
          <ul className="list-disc space-y-1 pl-5" data-testid="verdict-reasons">
            {score.reasons.map((r) => (
              <li key={r}>{r}</li>
            ))}
          </ul>
        ) : (
          <p>Every condition the verdict rests on was met.</p>
        )}
        {score.notes?.length ? (
          <ul className="space-y-1 text-sm text-graphite-600 dark:text-graphite-300">
            {score.notes.map((n) => (
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
        <table className="w-full text-left text-sm">
          <caption className="px-3 pt-3 text-left font-semibold">Every condition</caption>
          <thead>
            <tr className="border-b border-graphite-200 text-graphite-600 dark:border-asphalt-700 dark:text-graphite-300">
              <th className="px-3 py-2 font-medium">Condition</th>
              <th className="px-3 py-2 font-medium">Value</th>
              <th className="px-3 py-2 font-medium">Needed</th>
              <th className="px-3 py-2 font-medium">State</th>
            </tr>
          </thead>
          <tbody>
            {score.conditions.map((c) => (
              <tr key={c.key} className="border-b border-graphite-100 last:border-0 dark:border-asphalt-700" data-condition={c.key}>
                <td className="px-3 py-2">{c.label}</td>
                <td className="tabular px-3 py-2">{formatConditionValue(c).replace(/^-$/, "—")}</td>
                <td className="tabular px-3 py-2">{formatConditionRequirement(c).replace(/^-$/, "—")}</td>
                <td className="px-3 py-2">
                  {c.met ? (
                    <span className="inline-flex items-center gap-1 text-teal-700 dark:text-teal-300">
                      <CircleCheck aria-hidden className="size-4" /> Met
                    </span>
                  ) : c.advisory ? (
                    <span className="inline-flex items-center gap-1 text-signal-700 dark:text-signal-300">
                      <CircleMinus aria-hidden className="size-4" /> Note
                    </span>
                  ) : (
                    <span className="inline-flex items-center gap-1 text-stop-600 dark:text-stop-400">
                      <CircleX aria-hidden className="size-4" /> Not met
                    </span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
    </div>
  )
}
