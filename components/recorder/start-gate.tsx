"use client"
import { ClipboardCheck, ClipboardX, Play, ShieldAlert } from "lucide-react"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { Bullets } from "@/components/ui/bullets"
import { formatDateTime } from "@/lib/format"
import { GATE_CHECKS } from "@/lib/recorder/gate-checks"

type Blocker = { key: string; message: string }
export type ChecklistSummary = {
  ready: boolean
  blockers: Blocker[]
  completedBy: string | null
  completedAt: string
}

const CAUTIONS = [
  "The driver never operates the phone while the vehicle moves: the co-driver logs.",
  "Obey traffic law and drive for the road and traffic; no learn is worth a risk.",
  "The vehicle maker's service information and local regulations come first.",
  "The vehicle's own confirmation that the learn is done governs. The score never replaces it.",
]

/** The start screen's second step: the job checklist's state, the pre-drive checks, the cautions, Start. */
export function StartGate({
  checklist,
  jobChosen,
  checks,
  onCheck,
  ready,
  onReady,
  canStart,
  onBack,
  onStart,
}: {
  checklist: ChecklistSummary | null
  jobChosen: boolean
  checks: Record<string, boolean>
  onCheck: (key: string, on: boolean) => void
  ready: boolean
  onReady: (on: boolean) => void
  canStart: boolean
  onBack: () => void
  onStart: () => void
}) {
  const { timeZone } = useFormatPrefs()
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Before you drive</h1>
      {checklist ? (
        <section
          className={`space-y-1 rounded-xl border-2 p-3 ${checklist.ready ? "border-teal-400" : "border-stop-500"}`}
          data-testid="checklist-status"
        >
          <h2 className="flex items-center gap-2 font-semibold">
            {checklist.ready ? (
              <ClipboardCheck aria-hidden className="size-5 text-teal-300" />
            ) : (
              <ClipboardX aria-hidden className="size-5 text-stop-400" />
            )}
            {checklist.ready ? "Job checklist: ready" : "Job checklist: not ready"}
          </h2>
          <p className="text-sm text-graphite-300">
            {checklist.completedBy ? `Filled in by ${checklist.completedBy}` : "Filled in"}
            {checklist.completedAt ? `, ${formatDateTime(checklist.completedAt, timeZone)}` : ""}
          </p>
          {checklist.blockers.length ? (
            <ul className="list-disc space-y-1 pl-5">
              {checklist.blockers.map((b) => (
                <li key={b.key}>{b.message}</li>
              ))}
            </ul>
          ) : null}
        </section>
      ) : jobChosen ? (
        <p className="rounded-xl bg-asphalt-800 p-3 text-graphite-200" data-testid="checklist-status">
          No checklist on the job for this calibration yet. Confirm each check here.
        </p>
      ) : null}
      <section className="space-y-1 rounded-xl bg-asphalt-800 p-3">
        {GATE_CHECKS.map((c) => (
          <label key={c.key} className="flex min-h-12 items-center gap-3">
            <input
              type="checkbox"
              className="size-6 shrink-0 accent-signal-400"
              checked={Boolean(checks[c.key])}
              onChange={(e) => onCheck(c.key, e.target.checked)}
              data-testid={`gate-${c.key}`}
            />
            <span>{c.text}</span>
          </label>
        ))}
      </section>
      <section className="space-y-1 rounded-xl border-2 border-signal-400 p-3" data-testid="cautions">
        <h2 className="flex items-center gap-2 font-semibold text-signal-300">
          <ShieldAlert aria-hidden className="size-5" /> Safety
        </h2>
        <Bullets className="list-disc space-y-1 pl-5" items={CAUTIONS} />
      </section>
      <label className="flex min-h-12 items-center gap-3 rounded-xl bg-asphalt-800 p-3 font-semibold">
        <input
          type="checkbox"
          className="size-6 shrink-0 accent-signal-400"
          checked={ready}
          onChange={(e) => onReady(e.target.checked)}
          data-testid="gate-ready"
        />
        The vehicle is out of the bay, running and ready to drive.
      </label>
      <div className="grid grid-cols-3 gap-2">
        <button type="button" onClick={onBack} className="min-h-16 rounded-xl bg-asphalt-700 font-semibold">
          Back
        </button>
        <button
          type="button"
          disabled={!canStart}
          data-testid="start-drive"
          onClick={onStart}
          className="col-span-2 flex min-h-16 items-center justify-center gap-2 rounded-xl bg-signal-400 text-xl font-bold text-graphite-950 disabled:opacity-40"
        >
          <Play aria-hidden /> Start
        </button>
      </div>
      {!canStart ? <p className="text-center text-sm text-graphite-300">Tick every check above to start.</p> : null}
    </div>
  )
}
