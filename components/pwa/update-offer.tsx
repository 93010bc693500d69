"use client"
import { RefreshCw } from "lucide-react"
import type { Workbox } from "workbox-window"

/** A new version of the app is waiting: reload into it (offered only when no drive is being recorded). */
export function UpdateOffer({ workbox }: { workbox: Workbox }) {
  return (
    <div
      role="status"
      className="fixed inset-x-3 bottom-3 z-50 flex items-center gap-3 rounded-xl bg-asphalt-700 p-3 text-white shadow-lg"
    >
      <span className="flex-1">A new version of Straightaway is ready.</span>
      <button
        type="button"
        className="flex min-h-12 items-center gap-2 rounded-lg bg-signal-400 px-4 font-bold text-graphite-950"
        onClick={() => {
          workbox.addEventListener("controlling", () => window.location.reload())
          workbox.messageSkipWaiting()
        }}
      >
        <RefreshCw aria-hidden className="size-5" /> Reload
      </button>
    </div>
  )
}
