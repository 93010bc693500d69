"use client"
import { CloudOff, CloudUpload, CircleCheck, TriangleAlert } from "lucide-react"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { formatTimeWithSeconds, plural } from "@/lib/format"
import { getRecorder, useRecorder } from "./use-recorder"

/** Samples waiting, last synced, and any write the server refused (kept here until someone looks). */
export function SyncStatus() {
  const sync = useRecorder((s) => s.sync)
  // In the shop's time zone, as every other time in the product, whatever the phone's own locale and zone.
  const { timeZone } = useFormatPrefs()
  // a co-driver's own phone sends marks only
  const marksOnly = useRecorder((s) => s.meta?.role === "co-driver")
  const waiting = sync.waitingSamples + sync.waitingOther
  const Icon = sync.failed.length
    ? TriangleAlert
    : sync.state === "waiting"
      ? CloudOff
      : waiting
        ? CloudUpload
        : CircleCheck
  const word =
    sync.state === "signed-out"
      ? "Signed out: sign in again to send"
      : sync.state === "waiting"
        ? "No network: saved on this phone"
        : waiting
          ? "Sending"
          : "All sent"
  return (
    <div
      className="rounded-lg bg-asphalt-800 px-3 py-2 text-sm text-graphite-200"
      data-testid="sync-status"
      data-waiting={sync.waitingSamples}
      data-state={sync.state}
    >
      <div className="flex flex-wrap items-center gap-x-2 gap-y-0.5">
        <Icon aria-hidden className="size-5 shrink-0" />
        <span className="font-semibold whitespace-nowrap">{word}</span>
        <span className="ml-auto tabular">
          {marksOnly ? plural(sync.waitingOther, "mark") : plural(sync.waitingSamples, "sample")} waiting · last synced{" "}
          {sync.lastSyncedAt ? formatTimeWithSeconds(sync.lastSyncedAt, timeZone) : "not yet"}
        </span>
      </div>
      {sync.failed.map((f) => (
        <div key={f.key} className="mt-2 flex items-center gap-2 rounded bg-stop-700/40 p-2 text-stop-400" role="alert">
          <TriangleAlert aria-hidden className="size-4 shrink-0" />
          <span className="flex-1">
            The server refused {f.type === "samples" ? `${f.samples.length} samples` : f.type.replace("-", " ")}:{" "}
            {f.failed?.message}
          </span>
          <button
            type="button"
            className="min-h-16 rounded-lg border-2 border-stop-400 px-3 font-semibold"
            onClick={() => void getRecorder().retryFailed(f.key)}
          >
            Try again
          </button>
        </div>
      ))}
    </div>
  )
}
