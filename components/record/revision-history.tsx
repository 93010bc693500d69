import { History } from "lucide-react"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import type { Verdict } from "@/lib/scoring/types"
import { LocalTime } from "@/components/ui/local-time"

export interface RevisionRow {
  revision: number
  causeText: string
  verdict: Verdict
  createdAt: string
  byName: string | null
  code: string
}

/** The record's revisions, newest first: when, why, the verdict then, and the code its PDFs carry. */
export function RevisionHistory({ revisions, finished }: { revisions: RevisionRow[]; finished: boolean }) {
  if (!revisions.length)
    return (
      <p className="text-sm text-graphite-600 dark:text-graphite-300">
        {finished
          ? "No revision yet. The record gets its first one, with its verification code, the first time it is opened, e-mailed or shared."
          : "The record gets its first revision when the drive is finished."}
      </p>
    )
  const changed = revisions.some((r, i) => i < revisions.length - 1 && r.verdict !== revisions[i + 1]!.verdict)
  return (
    <div className="space-y-2" data-testid="revision-history">
      {changed ? (
        <p className="flex items-start gap-2 text-sm font-semibold" data-testid="verdict-changed">
          <History aria-hidden className="mt-0.5 size-4 shrink-0" /> The verdict changed after the finish. Records sent
          before show the old verdict.
        </p>
      ) : null}
      <ol className="divide-y divide-graphite-100 dark:divide-asphalt-700">
        {revisions.map((r, i) => (
          <li
            key={r.revision}
            className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1 py-2 text-sm"
            data-testid="revision-row"
          >
            <span className="min-w-0">
              <span className="font-semibold">
                Revision {r.revision}
                {i === 0 ? " (latest)" : ""}
              </span>
              {" · "}
              {r.causeText}
              {r.byName ? ` by ${r.byName}` : ""}
              <br />
              <LocalTime iso={r.createdAt} className="text-graphite-600 dark:text-graphite-300" />
              {" · code "}
              <span className="font-mono">{r.code}</span>
            </span>
            <VerdictBadge verdict={r.verdict} />
          </li>
        ))}
      </ol>
    </div>
  )
}
