"use client"
import { clsx } from "clsx"
import { CloudOff, Radio } from "lucide-react"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { formatClock, formatTime } from "@/lib/format"
import { CLOCKS, LearnState, useDriveClock } from "./drive-clock"
import { useRecorder } from "./use-recorder"

/** The learn's words on the co-driver's summary: teal once the learn completed. */
const LEARN_LOOK = {
  done: { box: "text-teal-300", icon: "size-4" },
  waiting: { box: "text-graphite-300", icon: "size-4" },
}

function Stat({
  label,
  value,
  of,
  testId,
  raw,
}: {
  label: string
  value: string
  of?: string
  testId: string
  raw: number | null
}) {
  return (
    <div className="rounded-lg bg-asphalt-900/60 px-1 py-1 text-center" data-testid={testId} data-value={raw ?? ""}>
      <div className="text-xs text-graphite-300">{label}</div>
      <div className="tabular text-xl leading-tight font-bold text-white">
        {value}
        {of ? <span className="text-xs font-semibold text-graphite-300">/{of}</span> : null}
      </div>
    </div>
  )
}

/**
 * What the co-driver needs above the buttons, in little height: the job, the minutes so far, the learn,
 * and whether this phone is in touch with the rest of the crew (else it shows what it holds).
 */
export function CrewSummary() {
  const drive = useDriveClock()
  const info = useRecorder((s) => s.driveInfo)
  const live = useRecorder((s) => s.live)
  const waitingMarks = useRecorder((s) => s.sync.waitingOther)
  const scoreAsOf = useRecorder((s) => s.scoreAsOf)
  const { timeZone } = useFormatPrefs()
  if (!drive) return null
  const { meta, profile: p, score, left, elapsedS, cleared } = drive
  const vehicle = info?.vehicleDescription ?? meta.vehicleDescription ?? meta.label
  const secondPhone = meta.role === "co-driver"
  const offline = live.state === "offline"
  const syncWord =
    live.state === "live" || live.state === "polling"
      ? "In touch with the crew"
      : offline
        ? "Offline: showing what this phone holds"
        : "Connecting…"
  return (
    <section
      className="space-y-1.5 rounded-xl bg-asphalt-800 p-2"
      data-testid="crew-summary"
      data-verdict={score?.verdict ?? ""}
      aria-label="The drive so far"
    >
      <div className="flex items-center gap-2 text-sm">
        <span className="min-w-0 flex-1 truncate font-semibold" data-testid="crew-job">
          {info?.roNumber ? `RO ${info.roNumber} · ` : ""}
          {vehicle}
        </span>
      </div>
      <div className="grid grid-cols-4 gap-1">
        <Stat testId="crew-elapsed" raw={elapsedS} label="Elapsed" value={formatClock(elapsedS)} />
        {CLOCKS.map(({ name, label, needed }) => (
          <Stat
            key={name}
            testId={`crew-${name}`}
            raw={score?.[`${name}Seconds`] ?? null}
            label={label}
            value={formatClock(score?.[`${name}SecondsBeforeClear`] ?? 0)}
            of={formatClock(p[needed] * 60)}
          />
        ))}
        <Stat
          testId="crew-left"
          raw={left?.minutesLeft ?? null}
          label="Left"
          value={left?.minutesLeft == null ? "—" : left.minutesLeft.toFixed(0)}
        />
      </div>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-0.5 text-sm">
        <LearnState
          as="span"
          testId="crew-learn"
          cleared={cleared}
          className="inline-flex items-center gap-1 font-semibold"
          look={LEARN_LOOK}
        />
        <span
          className={clsx("ml-auto inline-flex items-center gap-1", offline && "text-signal-300")}
          data-testid="crew-sync"
          data-state={live.state}
        >
          {offline ? <CloudOff aria-hidden className="size-4" /> : <Radio aria-hidden className="size-4" />}
          {syncWord}
          {waitingMarks ? ` · ${waitingMarks} to send` : ""}
        </span>
      </div>
      {secondPhone && offline && scoreAsOf ? (
        <p className="text-xs text-graphite-300">
          Minutes as of {formatTime(scoreAsOf, timeZone)}, the last word from the server.
        </p>
      ) : null}
    </section>
  )
}
