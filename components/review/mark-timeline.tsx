import { MARK_ICON } from "@/components/drives/mark-icon"
import { formatLengthFt, type UnitSystem } from "@/lib/format"
import { formatDuration, MARK_LABEL, type RecordMark } from "@/lib/record"

/** Every mark in time order, with when, what and who logged it. */
export function MarkTimeline({
  marks,
  startMs,
  units = "imperial",
}: {
  marks: RecordMark[]
  startMs: number
  units?: UnitSystem
}) {
  if (marks.length === 0) return <p className="text-graphite-600 dark:text-graphite-300">No marks were logged.</p>
  return (
    <ol className="space-y-2" data-testid="mark-timeline">
      {marks.map((m, i) => {
        const Icon = MARK_ICON[m.kind] ?? MARK_ICON.note!
        return (
          <li key={i} className="flex items-start gap-3">
            <span className="w-24 shrink-0 tabular text-sm text-graphite-600 dark:text-graphite-300">
              {formatDuration(Math.max(0, (m.t - startMs) / 1000))}
            </span>
            <Icon aria-hidden className="mt-0.5 size-4 shrink-0" />
            <span className="min-w-0">
              <span className="font-medium">{MARK_LABEL[m.kind] ?? m.kind}</span>
              {m.gapFt != null ? <span> · {formatLengthFt(m.gapFt, units)}</span> : null}
              {m.text ? <span> · {m.text}</span> : null}
              {m.byName ? (
                <span className="text-sm text-graphite-600 dark:text-graphite-300"> · {m.byName}</span>
              ) : null}
            </span>
          </li>
        )
      })}
    </ol>
  )
}
