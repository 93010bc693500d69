import { CircleCheck, Hourglass } from "lucide-react"
import type { ReactNode } from "react"
import { formatDuration } from "@/lib/format"
import { useRecorder } from "./use-recorder"

/** The two clocks the learn needs: the time so far (before the learn-complete mark) against the minutes needed. */
export const CLOCKS = [
  { name: "qualifying", label: "Qualifying", needed: "minQualifyingMinutes" },
  { name: "following", label: "Following", needed: "minFollowingMinutes" },
] as const

/**
 * The learn's state in a box of its own, an icon and words: a check and the minute once the learn completed, else an
 * hourglass. `look` styles the box and the icon for each state; `data-cleared` tells the tests which one shows.
 */
export function LearnState({
  as: Box = "div",
  testId,
  cleared,
  className,
  look,
  children,
}: {
  as?: "div" | "span"
  testId: string
  cleared: number | null
  className: string
  look: Record<"done" | "waiting", { box: string; icon: string }>
  children?: ReactNode
}) {
  const { box, icon } = cleared !== null ? look.done : look.waiting
  return (
    <Box className={`${className} ${box}`} data-testid={testId} data-cleared={cleared !== null}>
      {cleared !== null ? (
        <>
          <CircleCheck aria-hidden className={icon} />
          {`Learn complete at ${formatDuration(cleared)}`}
        </>
      ) : (
        <>
          <Hourglass aria-hidden className={icon} />
          Learn not complete yet
        </>
      )}
      {children}
    </Box>
  )
}

/**
 * What the driver's meters and the co-driver's summary both read off the recorder: the drive's profile, the live
 * score, the predicted minutes left, the time since the start and when the learn completed. Null before a drive.
 */
export function useDriveClock() {
  const meta = useRecorder((s) => s.meta)
  const score = useRecorder((s) => s.score)
  const left = useRecorder((s) => s.minutesLeft)
  const nowMs = useRecorder((s) => s.nowMs)
  if (!meta) return null
  return {
    meta,
    profile: meta.profile,
    score,
    left,
    elapsedS: Math.max(0, (nowMs - meta.startedAtMs) / 1000),
    cleared: score?.clearedAtSeconds ?? null,
  }
}
