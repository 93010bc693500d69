"use client"
import { CircleCheck, CloudOff, Hourglass, Radio } from "lucide-react"
import { useRouter } from "next/navigation"
import { useEffect, useState } from "react"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { formatLengthFt } from "@/lib/format"
import { MARK_LABEL } from "@/lib/labels"
import { connectLive, type LiveConnection, type LiveMark } from "@/lib/recorder/live-client"
import type { Score } from "@/lib/scoring/types"

const minutes = (s: number) => (s / 60).toFixed(1)

/** A lead watching a drive being recorded: the crew's marks and the live score, as the phones see them. */
export function LiveDrive({ driveId }: { driveId: string }) {
  const { units } = useFormatPrefs()
  const router = useRouter()
  const [marks, setMarks] = useState<LiveMark[]>([])
  const [score, setScore] = useState<Score | null>(null)
  const [connection, setConnection] = useState<LiveConnection>("connecting")
  useEffect(() => {
    const link = connectLive(driveId, {
      snapshot: (s) => {
        setMarks(s.marks)
        setScore(s.score)
      },
      mark: (m) =>
        setMarks((list) =>
          list.some((x) => x.id === m.id)
            ? list
            : [...list, m].sort((a, b) => a.t - b.t || (a.seq ?? 0) - (b.seq ?? 0)),
        ),
      unmark: (id) => setMarks((list) => list.filter((m) => m.id !== id)),
      status: (s) => {
        if (s.status === "finished") router.refresh()
      },
      score: setScore,
      connection: (state) => setConnection(state),
    })
    return () => link.close()
  }, [driveId, router])
  const t0 = score?.startedAtMs ?? marks[0]?.t ?? 0
  return (
    <div
      className="space-y-3"
      data-testid="live-drive"
      data-marks={marks.length}
      data-following={score?.followingSeconds ?? ""}
    >
      <p
        className="flex items-center gap-2 text-sm text-graphite-600 dark:text-graphite-300"
        data-testid="live-drive-connection"
        data-state={connection}
      >
        {connection === "offline" ? (
          <CloudOff aria-hidden className="size-4" />
        ) : (
          <Radio aria-hidden className="size-4" />
        )}
        {connection === "offline"
          ? "No connection: showing the last word from the crew"
          : connection === "connecting"
            ? "Connecting…"
            : "Live from the crew"}
      </p>
      {score ? (
        <dl className="grid grid-cols-3 gap-2 text-center">
          <div>
            <dt className="text-xs text-graphite-600 dark:text-graphite-300">Qualifying</dt>
            <dd className="tabular text-2xl font-bold">{minutes(score.qualifyingSecondsBeforeClear)} min</dd>
          </div>
          <div>
            <dt className="text-xs text-graphite-600 dark:text-graphite-300">Following</dt>
            <dd className="tabular text-2xl font-bold">{minutes(score.followingSecondsBeforeClear)} min</dd>
          </div>
          <div>
            <dt className="text-xs text-graphite-600 dark:text-graphite-300">Learn</dt>
            <dd className="flex items-center justify-center gap-1 font-semibold">
              {score.clearedAtSeconds !== null ? (
                <CircleCheck aria-hidden className="size-4" />
              ) : (
                <Hourglass aria-hidden className="size-4" />
              )}
              {score.clearedAtSeconds !== null
                ? `complete at ${minutes(score.clearedAtSeconds)} min`
                : "not complete yet"}
            </dd>
          </div>
        </dl>
      ) : null}
      <ul className="space-y-1 text-sm">
        {marks.map((m) => (
          <li key={m.id} className="flex gap-2">
            <span className="w-16 tabular text-graphite-600 dark:text-graphite-300">
              {minutes((m.t - t0) / 1000)} min
            </span>
            <span className="font-semibold">{MARK_LABEL[m.kind] ?? m.kind}</span>
            {m.gapFt != null ? <span>{formatLengthFt(m.gapFt, units)}</span> : null}
            {m.text ? <span className="truncate">{m.text}</span> : null}
          </li>
        ))}
      </ul>
    </div>
  )
}
