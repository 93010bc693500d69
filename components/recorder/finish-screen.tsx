"use client"
import { ShieldAlert } from "lucide-react"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import { SyncStatus } from "./sync-status"
import { useRecorder } from "./use-recorder"

/** The verdict with its reasons, from the server once it has the whole drive. */
export function FinishScreen({ onNewDrive }: { onNewDrive: () => void }) {
  const meta = useRecorder((s) => s.meta)
  const serverScore = useRecorder((s) => s.serverScore)
  const localScore = useRecorder((s) => s.score)
  const score = serverScore ?? localScore
  if (!meta || !score) return null
  return (
    <div className="space-y-4" data-testid="finish-screen">
      <h1 className="text-2xl font-bold">Drive finished</h1>
      <p className="text-graphite-300">{meta.label}</p>
      <div className="flex items-center gap-3">
        <VerdictBadge verdict={score.verdict} size="lg" />
        <span className="text-sm text-graphite-300" data-testid="score-source">
          {serverScore ? "Scored by the server" : "Scored on this phone; the server scores it when the network returns"}
        </span>
      </div>
      <ul className="list-disc space-y-1 pl-5" data-testid="verdict-reasons">
        {score.reasons.length ? score.reasons.map((r) => <li key={r}>{r}</li>) : <li>Every condition of the profile was met.</li>}
        {score.notes.map((n) => (
          <li key={n} className="text-graphite-300">
            {n}
          </li>
        ))}
      </ul>
      <p className="flex gap-2 rounded-xl border-2 border-signal-400 p-3">
        <ShieldAlert aria-hidden className="size-5 shrink-0 text-signal-300" />
        This score describes the drive. Whether the calibration is complete is what the vehicle itself reports, following
        the maker&apos;s service information; the score never replaces that.
      </p>
      <SyncStatus />
      <div className="grid grid-cols-2 gap-2">
        <a href="/drives" className="flex min-h-14 items-center justify-center rounded-xl bg-asphalt-700 font-semibold">
          All drives
        </a>
        <button type="button" onClick={onNewDrive} className="min-h-14 rounded-xl bg-signal-400 font-bold text-graphite-950">
          New drive
        </button>
      </div>
    </div>
  )
}
