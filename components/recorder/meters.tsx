"use client"
import { clsx } from "clsx"
import { CloudOff, Gauge, Hourglass, Link2, Radio, Timer, TriangleAlert, type LucideIcon } from "lucide-react"
import { formatClock, formatDistance, formatLengthRangeFt, formatSpeed, plural, speedUnit } from "@/lib/format"
import { speedMeterWords } from "@/lib/recorder/profile-words"
import { mpsToMph } from "@/lib/units"
import { CLOCKS, LearnState, useDriveClock } from "./drive-clock"
import { useRecorder, useRecorderUnits } from "./use-recorder"

/** A no-break space before each unit, so a narrow meter never puts "56+" and "km/h" on two lines. */
function keepUnitsWithNumbers(text: string) {
  return text.replace(/ (mph|km\/h|ft|m)\b/g, "\u00a0$1")
}

/** How each learn clock looks on the driver's meters; a clock that has its minutes takes its colour. */
const CLOCK_LOOK = {
  qualifying: { icon: Timer, done: "signal" },
  following: { icon: Link2, done: "teal" },
} as const

/** The learn's box on the driver's meters: teal once the learn completed. */
const LEARN_LOOK = {
  done: { box: "border-teal-400", icon: "size-5 shrink-0 text-teal-300" },
  waiting: { box: "border-asphalt-700", icon: "size-5 shrink-0" },
}

/** The meters after the learn clocks, in their order: their words and icons (what each reads is worked out live). */
const DRIVE_METERS = [
  { name: "elapsed", label: "Elapsed", icon: Hourglass },
  { name: "left", label: "Predicted left", icon: Hourglass },
  { name: "harsh", label: "Harsh events", icon: TriangleAlert },
] as const

const TONES = {
  plain: "border-asphalt-700",
  signal: "border-signal-400",
  teal: "border-teal-400",
  stop: "border-stop-400",
}

/** What a meter reads now; `raw` is the unrounded figure behind `value` (data-value, for the tests). */
interface Reading {
  value: string
  unit: string
  detail?: string
  tone?: keyof typeof TONES
  raw?: number | null
}

function Meter({
  label,
  icon: Icon,
  value,
  unit,
  detail,
  tone = "plain",
  testId,
  raw,
}: Reading & { label: string; icon: LucideIcon; testId: string }) {
  return (
    <div
      className={clsx("rounded-xl border-2 bg-asphalt-800 p-3", TONES[tone])}
      data-testid={testId}
      data-value={raw ?? ""}
    >
      <div className="flex items-center gap-1.5 text-sm font-semibold text-graphite-300">
        <Icon aria-hidden className="size-4" />
        {label}
      </div>
      <div className="tabular text-5xl leading-tight font-bold text-white">
        {value}
        <span className="ml-1 text-xl font-semibold text-graphite-300">{unit}</span>
      </div>
      {detail ? <div className="text-sm text-graphite-300">{detail}</div> : null}
    </div>
  )
}

/** The live meters: big numerals, readable at arm's length, every state with a word and an icon. */
export function Meters() {
  const drive = useDriveClock()
  const speedMps = useRecorder((s) => s.speedMps)
  const live = useRecorder((s) => s.live.state)
  const markCount = useRecorder((s) => s.knownMarks.length)
  const units = useRecorderUnits()
  if (!drive) return null
  const { profile: p, score, left, elapsedS, cleared } = drive
  const mph = speedMps === null ? null : mpsToMph(speedMps)
  // The band decision stays in mph against the profile's stored mph; only the words are in the shop's units.
  const inBand = mph !== null && mph >= p.minSpeedMph && (p.maxSpeedMph === null || mph <= p.maxSpeedMph)
  const gap = `, gap ${formatLengthRangeFt(p.leadGapFt.min, p.leadGapFt.max, units)}`
  const timedOut = elapsedS >= p.maxDriveMinutes * 60
  const minutesLeft = left?.minutesLeft ?? null
  const accel = score?.harshEvents.accel ?? 0
  const decel = score?.harshEvents.decel ?? 0
  const harsh = accel + decel
  const readings: Record<(typeof DRIVE_METERS)[number]["name"], Reading> = {
    elapsed: {
      raw: elapsedS,
      value: formatClock(elapsedS),
      unit: "min",
      detail: timedOut
        ? `Past the ${p.maxDriveMinutes} min limit: the drive has timed out`
        : `limit ${p.maxDriveMinutes} min`,
      tone: timedOut ? "stop" : "plain",
    },
    left: {
      raw: minutesLeft,
      value: minutesLeft === null ? "—" : minutesLeft.toFixed(0),
      unit: "min",
      detail: minutesLeft === null ? "after some qualifying time" : "at the rate so far",
    },
    harsh: {
      raw: harsh,
      value: String(harsh),
      unit: harsh === 1 ? "event" : "events",
      detail: `${accel} speeding up · ${decel} braking`,
      tone: harsh > 0 ? "signal" : "plain",
    },
  }
  return (
    <div className="grid grid-cols-2 gap-2">
      <Meter
        testId="meter-speed"
        raw={speedMps}
        label={inBand ? "Speed: qualifying" : "Speed: paused"}
        icon={Gauge}
        value={speedMps === null ? "—" : formatSpeed(speedMps, units).split(" ")[0]!}
        unit={speedUnit(units)}
        detail={keepUnitsWithNumbers(speedMeterWords(p, mph, units))}
        tone={inBand ? "signal" : "plain"}
      />
      {CLOCKS.map(({ name, label, needed }) => {
        const { icon, done } = CLOCK_LOOK[name]
        const before = score?.[`${name}SecondsBeforeClear`] ?? 0
        return (
          <Meter
            key={name}
            testId={`meter-${name}`}
            raw={score?.[`${name}Seconds`] ?? 0}
            label={label}
            icon={icon}
            value={formatClock(before)}
            unit="min"
            detail={keepUnitsWithNumbers(`of ${p[needed]} min${name === "following" ? gap : ""}`)}
            tone={before >= p[needed] * 60 ? done : "plain"}
          />
        )
      })}
      {DRIVE_METERS.map(({ name, label, icon }) => (
        <Meter key={name} testId={`meter-${name}`} label={label} icon={icon} {...readings[name]} />
      ))}
      <LearnState
        testId="meter-learn"
        cleared={cleared}
        className="col-span-2 flex items-center gap-2 rounded-xl border-2 bg-asphalt-800 px-3 py-2 text-lg font-semibold"
        look={LEARN_LOOK}
      >
        <span
          className="ml-auto inline-flex items-center gap-1 text-sm font-normal text-graphite-300"
          data-testid="meter-live"
          data-state={live}
        >
          {live === "offline" ? <CloudOff aria-hidden className="size-4" /> : <Radio aria-hidden className="size-4" />}
          {live === "offline"
            ? "Offline: this phone's marks"
            : live === "connecting"
              ? "Connecting…"
              : "Crew marks live"}
        </span>
      </LearnState>
      <div
        className="col-span-2 text-xs text-graphite-400"
        data-testid="live-score"
        data-samples-used={score?.samplesUsed ?? 0}
        data-duration={score?.durationSeconds ?? 0}
        data-verdict={score?.verdict ?? ""}
        data-marks={markCount}
      >
        {plural(score?.samplesUsed ?? 0, "sample")} used · {formatDistance(score?.distanceMeters ?? 0, units)}
      </div>
    </div>
  )
}
