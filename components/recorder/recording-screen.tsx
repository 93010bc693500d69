"use client"
import { Flag, MapPinOff, UsersRound, Car } from "lucide-react"
import { useState } from "react"
import { gpsMessage } from "@/lib/recorder/position"
import { mpsToMph } from "@/lib/units"
import { CoDriverPanel } from "./co-driver-panel"
import { CrewSummary } from "./crew-summary"
import { Meters } from "./meters"
import { SyncStatus } from "./sync-status"
import { getRecorder, useRecorder, useRecorderUnits } from "./use-recorder"

/** Above this the driver's view shows only the meters (common practice, no source: walking pace is ~3 mph). */
const MOVING_MPH = 5

export function RecordingScreen() {
  const meta = useRecorder((s) => s.meta)
  const gps = useRecorder((s) => s.gps)
  const accuracyM = useRecorder((s) => s.accuracyM)
  const units = useRecorderUnits()
  const speedMps = useRecorder((s) => s.speedMps)
  const [mode, setMode] = useState<"driver" | "co-driver">(meta?.role === "co-driver" ? "co-driver" : "driver")
  const [confirmFinish, setConfirmFinish] = useState(false)
  if (!meta) return null
  const moving = speedMps !== null && mpsToMph(speedMps) > MOVING_MPH
  const message = gpsMessage(gps, accuracyM, meta.profile.maxAccuracyM, units)
  const secondPhone = meta.role === "co-driver"

  return (
    <div className="space-y-3" data-testid="recording-screen" data-moving={moving}>
      <div className="flex items-center gap-2">
        <span className="inline-flex shrink-0 items-center gap-1.5 rounded-full bg-signal-400 px-2 py-0.5 text-sm font-bold text-graphite-950">
          <span aria-hidden className="size-2 animate-pulse rounded-full bg-graphite-950" />{" "}
          {secondPhone ? "Co-driver" : "Recording"}
        </span>
        <span className="truncate text-graphite-300">{meta.label}</span>
      </div>
      {message ? (
        <p role="status" className="flex gap-2 rounded-lg bg-asphalt-800 p-2 text-signal-300" data-testid="gps-message">
          <MapPinOff aria-hidden className="size-5 shrink-0" /> {message}
        </p>
      ) : null}
      {mode === "driver" ? (
        <>
          <Meters />
          <p
            className="flex items-center gap-2 rounded-xl border-2 border-signal-400 p-3 text-lg font-semibold"
            data-testid="driver-caution"
          >
            <Car aria-hidden className="size-6 shrink-0" /> Eyes on the road. The co-driver logs marks; the driver does
            not touch the phone while moving.
          </p>
          <button
            type="button"
            onClick={() => setMode("co-driver")}
            className="flex min-h-16 w-full items-center justify-center gap-2 rounded-xl bg-teal-400 text-lg font-bold text-graphite-950"
            data-testid="co-driver-mode"
          >
            <UsersRound aria-hidden /> Co-driver: log marks
          </button>
        </>
      ) : (
        <>
          {/* The drive so far above the buttons, small enough that the buttons stay on screen. */}
          <CrewSummary />
          <CoDriverPanel />
          {!secondPhone ? (
            <button
              type="button"
              onClick={() => setMode("driver")}
              className="min-h-16 w-full rounded-xl bg-asphalt-700 text-lg font-semibold"
            >
              Back to the driver&apos;s meters
            </button>
          ) : null}
        </>
      )}
      <SyncStatus />
      {/* Finish is hidden while moving in every mode: no one finishes a drive at speed. */}
      {!moving ? (
        <>
          {!secondPhone ? (
            confirmFinish ? (
              <div className="grid grid-cols-2 gap-2">
                <button
                  type="button"
                  onClick={() => setConfirmFinish(false)}
                  className="min-h-16 rounded-xl bg-asphalt-700 font-semibold"
                >
                  Keep recording
                </button>
                <button
                  type="button"
                  data-testid="finish-confirm"
                  onClick={() => void getRecorder().finish()}
                  className="flex min-h-16 items-center justify-center gap-2 rounded-xl bg-signal-400 text-lg font-bold text-graphite-950"
                >
                  <Flag aria-hidden /> Finish now
                </button>
              </div>
            ) : (
              <button
                type="button"
                data-testid="finish-drive"
                onClick={() => setConfirmFinish(true)}
                className="flex min-h-16 w-full items-center justify-center gap-2 rounded-xl bg-asphalt-700 text-lg font-semibold"
              >
                <Flag aria-hidden /> Finish the drive
              </button>
            )
          ) : null}
        </>
      ) : null}
    </div>
  )
}
