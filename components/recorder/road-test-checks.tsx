"use client"
import { clsx } from "clsx"
import { Ban, CircleCheck, CircleX, ClipboardCheck } from "lucide-react"
import { useEffect, useState } from "react"
import type { CheckResult, RoadTestCheck } from "@/lib/drive-file/road-test"
import { SENSOR_LABEL } from "@/lib/labels"
import { CHECK_RESULT_LABEL, checkSpeedWords, checkTooSlowWords } from "@/lib/road-test/words"
import { mpsToMph } from "@/lib/units"
import { getRecorder, useRecorder, useRecorderUnits } from "./use-recorder"

const cacheKey = (driveId: string) => `straightaway.road-test.${driveId}`

/**
 * The drive's road-test checks, from the server (the drive may still be on its way there from the
 * outbox, so this asks again until it is) and kept on the phone for a reload without network.
 */
function keptChecks(driveId: string): RoadTestCheck[] | null {
  try {
    const kept = localStorage.getItem(cacheKey(driveId))
    return kept ? (JSON.parse(kept) as RoadTestCheck[]) : null
  } catch {
    return null
  }
}

function useRoadTestChecks(driveId: string | undefined): RoadTestCheck[] | null {
  // What the phone kept is shown at once for a new drive id (set during render); the server's answer replaces it.
  const [shown, setShown] = useState<{ driveId: string | undefined; checks: RoadTestCheck[] | null }>({
    driveId: undefined,
    checks: null,
  })
  if (shown.driveId !== driveId) setShown({ driveId, checks: driveId ? keptChecks(driveId) : null })
  useEffect(() => {
    if (!driveId) return
    let stopped = false
    let timer: ReturnType<typeof setTimeout> | undefined
    const ask = async (attempt: number) => {
      try {
        const res = await fetch(`/api/drives/${driveId}`, { cache: "no-store" })
        if (res.ok) {
          const body = (await res.json()) as { drive?: { roadTestChecks?: RoadTestCheck[] | null } }
          const list = body.drive?.roadTestChecks ?? []
          if (stopped) return
          setShown({ driveId, checks: list })
          try {
            localStorage.setItem(cacheKey(driveId), JSON.stringify(list))
          } catch {}
          return
        }
      } catch {}
      if (!stopped && attempt < 60) timer = setTimeout(() => void ask(attempt + 1), 2000)
    }
    void ask(0)
    return () => {
      stopped = true
      if (timer) clearTimeout(timer)
    }
  }, [driveId])
  return shown.driveId === driveId ? shown.checks : null
}

const RESULT_LOOK: Record<CheckResult, { Icon: typeof CircleCheck; on: string }> = {
  pass: { Icon: CircleCheck, on: "bg-teal-400 text-graphite-950" },
  fail: { Icon: CircleX, on: "bg-stop-600 text-white" },
  not_equipped: { Icon: Ban, on: "bg-graphite-300 text-graphite-950" },
}

/** Co-driver mode: the road-test checks of the job's systems, each with big pass / fail / not equipped buttons. */
export function RoadTestChecks() {
  const meta = useRecorder((s) => s.meta)
  const marks = useRecorder((s) => s.marks)
  const speedMps = useRecorder((s) => s.speedMps)
  const checks = useRoadTestChecks(meta?.id)
  const units = useRecorderUnits()
  const [busy, setBusy] = useState<string | null>(null)
  if (!checks || checks.length === 0) return null
  const latest = new Map<string, CheckResult>()
  for (const m of marks) if (m.kind === "check" && m.checkKey && m.result) latest.set(m.checkKey, m.result)
  // Compared in whole mph with the check's stored mph (as the scorer does); said in the shop's units.
  const mph = speedMps === null ? null : Math.round(mpsToMph(speedMps))
  const log = async (c: RoadTestCheck, result: CheckResult) => {
    setBusy(c.key)
    try {
      await getRecorder().addMark("check", { checkKey: c.key, result })
      try {
        navigator.vibrate?.(result === "pass" ? [60, 60, 60] : 80)
      } catch {}
    } finally {
      setBusy(null)
    }
  }
  return (
    <section
      className="space-y-3 rounded-xl border-2 border-teal-400 p-3"
      aria-labelledby="road-test-title"
      data-testid="road-test-checks"
    >
      <h2 id="road-test-title" className="flex items-center gap-2 text-lg font-bold">
        <ClipboardCheck aria-hidden className="size-6 shrink-0" /> Road test
      </h2>
      <p className="text-sm text-graphite-300">
        Try each function only where it is safe and legal, as the maker&apos;s service information says. The driver
        drives; the co-driver taps. A pass counts at the check&apos;s speed or faster; the speed is taken from the
        track.
      </p>
      <ul className="space-y-3">
        {checks.map((c) => {
          const done = latest.get(c.key)
          const slow = c.minSpeedMph !== null && (mph === null || mph < c.minSpeedMph) ? c.minSpeedMph : null
          return (
            <li
              key={c.key}
              className="space-y-2 rounded-lg bg-asphalt-800 p-2"
              data-testid={`check-${c.key}`}
              data-result={done ?? ""}
            >
              <div>
                <p className="font-semibold">{c.label}</p>
                <p className="text-sm text-graphite-300">
                  {SENSOR_LABEL[c.system] ?? c.system} · {checkSpeedWords(c.minSpeedMph, units)} ·{" "}
                  {c.need === "required" ? "required" : "where equipped"}
                  {done ? (
                    <span className="font-semibold text-white"> · logged: {CHECK_RESULT_LABEL[done]}</span>
                  ) : null}
                </p>
                {slow !== null ? <p className="text-sm text-signal-300">{checkTooSlowWords(slow, units)}</p> : null}
              </div>
              <div className="grid grid-cols-3 gap-2">
                {(["pass", "fail", "not_equipped"] as const).map((r) => {
                  const { Icon, on } = RESULT_LOOK[r]
                  return (
                    <button
                      key={r}
                      type="button"
                      disabled={busy === c.key}
                      aria-pressed={done === r}
                      data-testid={`check-${c.key}-${r}`}
                      onClick={() => void log(c, r)}
                      className={clsx(
                        "flex min-h-16 items-center justify-center gap-1.5 rounded-xl px-2 text-base leading-tight font-bold disabled:opacity-40",
                        done === r ? on : "bg-asphalt-700 text-white",
                      )}
                    >
                      <Icon aria-hidden className="size-5 shrink-0" /> {CHECK_RESULT_LABEL[r]}
                    </button>
                  )
                })}
              </div>
            </li>
          )
        })}
      </ul>
    </section>
  )
}
