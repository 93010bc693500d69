"use client"
import { MapPinned } from "lucide-react"
import { useEffect, useState } from "react"
import { formatDuration } from "@/lib/format"

type Line = {
  name: string
  direction: string
  medianClearSeconds: number
  drives: number
  trusted: boolean
  days: string | null
}
type State = { status: "loading" } | { status: "off" } | { status: "none" } | { status: "line"; line: Line }

/** The recorder's "good roads now" line, fetched from /api/roads/now (the road model stays on the server). */
export function GoodRoadsNow() {
  const [state, setState] = useState<State>({ status: "loading" })
  useEffect(() => {
    let live = true
    fetch("/api/roads/now", { credentials: "same-origin" })
      .then((res) => (res.ok ? res.json() : null))
      .then((body: { enabled: boolean; line: Line | null } | null) => {
        if (!live) return
        if (!body || !body.enabled) setState({ status: "off" })
        else setState(body.line ? { status: "line", line: body.line } : { status: "none" })
      })
      .catch(() => live && setState({ status: "off" }))
    return () => {
      live = false
    }
  }, [])
  if (state.status === "off" || state.status === "loading") return null
  return (
    <p className="flex items-start gap-2 rounded-xl bg-asphalt-800 p-3 text-graphite-100" data-testid="good-roads-now">
      <MapPinned aria-hidden className="mt-0.5 size-5 shrink-0 text-teal-300" />
      {state.status === "none" ? (
        <span>Good roads now: no past learn at this hour yet.</span>
      ) : (
        <span>
          <strong>Good roads now:</strong> {state.line.name}
          {state.line.direction ? ` (${state.line.direction})` : ""}, learn complete in a median{" "}
          {formatDuration(state.line.medianClearSeconds)}, from {state.line.drives}{" "}
          {state.line.drives === 1 ? "drive" : "drives"} at this hour
          {state.line.days ? ` on ${state.line.days}` : " (any day)"}
          {state.line.trusted ? "." : ": too few to trust."}
        </span>
      )}
    </p>
  )
}
