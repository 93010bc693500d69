"use client"
import { ShieldAlert } from "lucide-react"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import { describeReasons } from "@/lib/format/conditions"
import { RoadTestResult } from "./road-test-result"
import { SyncStatus } from "./sync-status"
import { useRecorder, useRecorderUnits } from "./use-recorder"

/** The verdict with its reasons, from the server once it has the whole drive. */
export function FinishScreen({ onNewDrive }: { onNewDrive: () => void }) {
  const meta = useRecorder((s) => s.meta)
  const serverScore = useRecorder((s) => s.serverScore)
  const localScore = useRecorder((s) => s.score)
  const score = serverScore ?? localScore
  const units = useRecorderUnits()
  if (!meta || !score) return null
  // The scorer's own reasons are in mph and feet: people read them in the shop's units.
  const { reasons, notes } = describeReasons(score, units)
  return (
    <div className="space-y-4" data-testid="finish-screen">
      <div>
        <h1 className="text-2xl font-bold">Drive finished</h1>
        <p className="text-graphite-300">{meta.label}</p>
      </div>
      <section
        className="space-y-3 rounded-xl bg-asphalt-800 p-3"
        aria-labelledby="drive-score"
        data-testid="finish-score"
        data-verdict={score.verdict}
        data-qualifying={score.qualifyingSeconds}
        data-following={score.followingSeconds}
      >
        <h2 id="drive-score" className="text-sm font-semibold tracking-wide text-graphite-300 uppercase">
          How the drive went (not the calibration result)
        </h2>
        <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
          <VerdictBadge verdict={score.verdict} size="lg" />
          <span className="text-sm text-graphite-300" data-testid="score-source">
            {serverScore
              ? "Scored by the server"
              : "Scored on this phone; the server scores it when the network returns"}
          </span>
        </div>
        <ul className="list-disc space-y-1 pl-5" data-testid="verdict-reasons">
          {reasons.length ? (
            reasons.map((r) => <li key={r}>{r}</li>)
          ) : (
            <li>Every condition the drive was held to was met.</li>
          )}
          {notes.map((n) => (
            <li key={n} className="text-graphite-300">
              {n}
            </li>
          ))}
        </ul>
      </section>
      <RoadTestResult score={score} units={units} />
      <section
        className="space-y-1 rounded-xl border-2 border-signal-400 p-3"
        aria-labelledby="final-word"
        data-testid="finish-caution"
      >
        <h2 id="final-word" className="flex items-center gap-2 text-lg font-bold">
          <ShieldAlert aria-hidden className="size-5 shrink-0 text-signal-300" /> Now check the vehicle: it has the
          final word
        </h2>
        <p>
          Its own learn status must read complete, with no driver-assist fault codes stored, and the function must work
          on the road, as the maker&apos;s service information says. This score describes the drive; it never replaces
          that.
        </p>
      </section>
      <SyncStatus />
      <div className="grid grid-cols-2 gap-2">
        {serverScore ? (
          <a
            href={`/drives/${meta.id}`}
            className="col-span-2 flex min-h-14 items-center justify-center rounded-xl bg-asphalt-700 font-semibold"
          >
            Open this drive
          </a>
        ) : null}
        <a href="/drives" className="flex min-h-14 items-center justify-center rounded-xl bg-asphalt-700 font-semibold">
          All drives
        </a>
        <button
          type="button"
          onClick={onNewDrive}
          className="min-h-14 rounded-xl bg-signal-400 font-bold text-graphite-950"
        >
          New drive
        </button>
      </div>
    </div>
  )
}
