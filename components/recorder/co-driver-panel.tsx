"use client"
import { clsx } from "clsx"
import {
  CircleCheck,
  CircleStop,
  CircleX,
  Flag,
  Link2,
  Link2Off,
  Pencil,
  Ruler,
  ShieldCheck,
  TriangleAlert,
  Undo2,
} from "lucide-react"
import { useState, type ReactNode } from "react"
import type { MarkKind } from "@/lib/drive-file/schema"
import { MARK_LABEL as MARK_WORD } from "@/lib/labels"
import { formatLengthFt } from "@/lib/format"
import { roundGapFt, timeGap, typedGapFt, type TimeGap } from "@/lib/recorder/time-gap"
import { RoadTestChecks } from "./road-test-checks"
import { getRecorder, useRecorder, useRecorderUnits } from "./use-recorder"

const buzz = (pattern: number | number[] = 40) => {
  try {
    navigator.vibrate?.(pattern)
  } catch {}
}

function Big({
  children,
  onClick,
  tone = "plain",
  testId,
  disabled,
}: {
  children: ReactNode
  onClick: () => void
  tone?: "plain" | "signal" | "teal" | "stop"
  testId?: string
  disabled?: boolean
}) {
  const tones = {
    plain: "bg-asphalt-700 text-white",
    signal: "bg-signal-400 text-graphite-950",
    teal: "bg-teal-400 text-graphite-950",
    stop: "bg-stop-600 text-white",
  }
  return (
    <button
      type="button"
      data-testid={testId}
      disabled={disabled}
      onClick={onClick}
      className={clsx(
        "flex min-h-16 items-center justify-center gap-2 rounded-xl px-3 text-lg font-bold disabled:opacity-40",
        tones[tone],
      )}
    >
      {children}
    </button>
  )
}

/** Time-gap counter: tap as the lead passes a roadside object, tap again as we pass it. */
function GapCounter({ onUse }: { onUse: (gapFt: number) => void }) {
  const speedMps = useRecorder((s) => s.speedMps)
  const units = useRecorderUnits()
  const unitWord = units === "metric" ? "metres" : "feet"
  const [leadAt, setLeadAt] = useState<number | null>(null)
  const [gap, setGap] = useState<TimeGap | null>(null)
  const [typed, setTyped] = useState("")
  return (
    <div className="space-y-2 rounded-xl border-2 border-teal-400 p-3" data-testid="gap-counter">
      <div className="grid grid-cols-2 gap-2">
        <Big
          testId="gap-lead-passed"
          onClick={() => {
            setLeadAt(Date.now())
            setGap(null)
            buzz()
          }}
        >
          Lead passes it
        </Big>
        <Big
          testId="gap-we-passed"
          disabled={leadAt === null}
          onClick={() => {
            if (leadAt === null) return
            setGap(timeGap(leadAt, Date.now(), speedMps))
            setLeadAt(null)
            buzz([30, 40, 30])
          }}
        >
          We pass it
        </Big>
      </div>
      {leadAt !== null ? (
        <p className="text-center text-graphite-300">Counting… tap when you pass the same object.</p>
      ) : null}
      {gap ? (
        <p className="text-center tabular text-xl" data-testid="gap-result">
          {gap.seconds.toFixed(1)} s
          {gap.gapFt === null ? ` (speed unknown: no ${unitWord})` : ` ≈ ${formatLengthFt(gap.gapFt, units)}`}
        </p>
      ) : null}
      <div className="flex gap-2">
        <label className="flex flex-1 items-center gap-2">
          <input
            inputMode="numeric"
            placeholder={`or type ${unitWord}`}
            aria-label={`Gap in ${unitWord}`}
            value={typed}
            onChange={(e) => setTyped(e.target.value.replace(/[^0-9]/g, ""))}
            className="min-h-16 w-full rounded-xl bg-asphalt-800 px-3 text-xl text-white"
            data-testid="gap-typed"
          />
        </label>
        <Big
          tone="teal"
          testId="gap-use"
          disabled={!(typed || gap?.gapFt != null)}
          onClick={() => {
            const ft = typed ? typedGapFt(Number(typed), units) : gap?.gapFt != null ? roundGapFt(gap.gapFt) : null
            if (ft === null) return
            onUse(ft)
            setTyped("")
            setGap(null)
          }}
        >
          Use gap
        </Big>
      </div>
    </div>
  )
}

/** Co-driver mode: the passenger logs what happens, with big buttons. */
export function CoDriverPanel() {
  // Every mark the phone knows (its own and the other phone's): the buttons follow the shared state.
  const marks = useRecorder((s) => s.knownMarks)
  const ownMarks = useRecorder((s) => s.marks)
  const finished = useRecorder(
    (s) => s.driveInfo?.status === "finished" || (s.meta !== null && s.meta.status !== "recording"),
  )
  const [asking, setAsking] = useState<"lead-on" | "gap" | null>(null)
  const [note, setNote] = useState<string | null>(null)
  const [flash, setFlash] = useState<string | null>(null)
  const leadOn = (() => {
    let on = false
    for (const m of marks) {
      if (m.kind === "lead-on") on = true
      if (m.kind === "lead-off") on = false
    }
    return on
  })()
  const units = useRecorderUnits()
  const log = async (kind: MarkKind, extra: { gapFt?: number; text?: string } = {}) => {
    await getRecorder().addMark(kind, extra)
    buzz(kind === "cleared" || kind === "verified" ? [60, 60, 60] : 50)
    setFlash(`${MARK_WORD[kind]} logged${extra.gapFt !== undefined ? ` (${formatLengthFt(extra.gapFt, units)})` : ""}`)
    setAsking(null)
  }
  const last = marks.at(-1)
  if (finished) {
    return (
      <div className="space-y-2" data-testid="co-driver-panel">
        <p
          role="status"
          className="flex items-center gap-2 rounded-xl border-2 border-teal-400 p-3 text-lg font-semibold"
          data-testid="marks-closed"
        >
          <Flag aria-hidden className="size-6 shrink-0" /> The drive is finished: it takes no new marks.
        </p>
        <p className="text-sm text-graphite-400" data-testid="mark-count" data-value={marks.length}>
          {marks.length} marks logged
        </p>
      </div>
    )
  }
  return (
    <div className="space-y-2" data-testid="co-driver-panel">
      <div className="grid grid-cols-2 gap-2">
        <Big testId="mark-lead-on" tone="teal" disabled={leadOn} onClick={() => setAsking("lead-on")}>
          <Link2 aria-hidden /> Lead on
        </Big>
        <Big testId="mark-gap" disabled={!leadOn} onClick={() => setAsking("gap")}>
          <Ruler aria-hidden /> Gap update
        </Big>
        <Big testId="mark-lead-off" disabled={!leadOn} onClick={() => void log("lead-off")}>
          <Link2Off aria-hidden /> Lead off
        </Big>
        <Big testId="mark-cleared" tone="signal" onClick={() => void log("cleared")}>
          <CircleCheck aria-hidden /> Learn complete
        </Big>
        <Big testId="mark-stopped" onClick={() => void log("stopped")}>
          <CircleStop aria-hidden /> Stopped
        </Big>
        <Big testId="mark-note" onClick={() => setNote("")}>
          <Pencil aria-hidden /> Note
        </Big>
      </div>
      <p className="flex items-center gap-2 text-sm text-signal-300" data-testid="verify-caution">
        <TriangleAlert aria-hidden className="size-4 shrink-0" /> Check the function only where traffic law allows; the
        driver keeps eyes on the road.
      </p>
      {/* Far apart on purpose: one must never be hit for the other. */}
      <div className="flex justify-between gap-16">
        <div className="grid flex-1">
          <Big testId="mark-verified" onClick={() => void log("verified")}>
            <ShieldCheck aria-hidden /> Verified
          </Big>
        </div>
        <div className="grid flex-1">
          <Big testId="mark-verify-failed" tone="stop" onClick={() => void log("verify-failed")}>
            <CircleX aria-hidden /> Verify failed
          </Big>
        </div>
      </div>
      {asking ? (
        <div className="space-y-2">
          <p className="font-semibold">{asking === "lead-on" ? "Lead on: how far ahead is it?" : "New gap estimate"}</p>
          <GapCounter onUse={(ft) => void log(asking, { gapFt: ft })} />
          <div className="grid gap-2">
            {asking === "lead-on" ? (
              <Big testId="lead-on-unknown" onClick={() => void log("lead-on")}>
                Lead on, gap not known yet
              </Big>
            ) : null}
            <Big onClick={() => setAsking(null)}>Cancel</Big>
          </div>
        </div>
      ) : null}
      {note !== null ? (
        <div className="space-y-2">
          <textarea
            aria-label="Note"
            value={note}
            onChange={(e) => setNote(e.target.value)}
            className="min-h-24 w-full rounded-xl bg-asphalt-800 p-3 text-lg text-white"
            data-testid="note-text"
          />
          <div className="grid grid-cols-2 gap-2">
            <Big
              testId="note-save"
              tone="teal"
              disabled={!note.trim()}
              onClick={() => void log("note", { text: note.trim() }).then(() => setNote(null))}
            >
              Save note
            </Big>
            <Big onClick={() => setNote(null)}>Cancel</Big>
          </div>
        </div>
      ) : null}
      <div className="flex items-center gap-2">
        <p className="flex-1 text-graphite-300" aria-live="polite" data-testid="mark-flash">
          {flash ?? (last ? `Last: ${MARK_WORD[last.kind]}` : "No marks yet")}
        </p>
        <Big
          testId="mark-undo"
          disabled={!ownMarks.length}
          onClick={() =>
            void getRecorder()
              .undoLastMark()
              .then((m) => {
                if (m) setFlash(`${MARK_WORD[m.kind]} taken back`)
                buzz(20)
              })
          }
        >
          <Undo2 aria-hidden /> Undo
        </Big>
      </div>
      <RoadTestChecks />
      <p className="text-sm text-graphite-400" data-testid="mark-count" data-value={marks.length}>
        {marks.length} marks logged
      </p>
    </div>
  )
}
