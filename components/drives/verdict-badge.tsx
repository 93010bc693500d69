// Plain class joining (clsx, no tailwind-merge) keeps this badge light enough for the recorder bundle.
import { clsx } from "clsx"
import { CircleAlert, CircleCheck, CircleHelp, CircleX, Radio } from "lucide-react"
import type { Verdict } from "@/lib/scoring/types"

export type { Verdict }

// Every verdict carries a word and an icon as well as a colour (never colour alone). Red is kept for
// "Not met", the one verdict that means the learn has not been shown to be done.
const VERDICT_LOOK: Record<Verdict, { word: string; Icon: typeof CircleCheck; className: string }> = {
  met: {
    word: "Met",
    Icon: CircleCheck,
    className:
      "border-teal-600 bg-teal-300/20 text-teal-700 dark:border-teal-400 dark:bg-teal-700/30 dark:text-teal-300",
  },
  short: {
    word: "Short",
    Icon: CircleAlert,
    className:
      "border-signal-600 bg-signal-300/30 text-signal-700 dark:border-signal-400 dark:bg-signal-700/30 dark:text-signal-300",
  },
  not_met: {
    word: "Not met",
    Icon: CircleX,
    className:
      "border-stop-600 bg-stop-400/15 text-stop-700 dark:border-stop-400 dark:bg-stop-700/30 dark:text-stop-400",
  },
  unverified: {
    word: "Unverified",
    Icon: CircleHelp,
    className:
      "border-graphite-500 bg-graphite-100 text-graphite-800 dark:border-graphite-400 dark:bg-asphalt-700 dark:text-graphite-100",
  },
}

/** A drive's verdict as word + icon + colour. `null` = the drive is still being recorded. */
export function VerdictBadge({
  verdict,
  size = "md",
  className,
}: {
  verdict: Verdict | null
  size?: "md" | "lg"
  className?: string
}) {
  const sizing = size === "lg" ? "gap-2 px-3 py-1.5 text-lg" : "gap-1.5 px-2 py-0.5 text-sm"
  const iconSize = size === "lg" ? "size-6" : "size-4"
  if (verdict === null) {
    return (
      <span
        data-verdict="recording"
        className={clsx(
          "inline-flex items-center rounded-full border-2 border-dashed border-graphite-400 font-semibold text-graphite-700 dark:text-graphite-200",
          sizing,
          className,
        )}
      >
        <Radio aria-hidden className={iconSize} />
        Recording
      </span>
    )
  }
  const { word, Icon, className: look } = VERDICT_LOOK[verdict]
  return (
    <span
      data-verdict={verdict}
      className={clsx("inline-flex items-center rounded-full border-2 font-semibold", sizing, look, className)}
    >
      <Icon aria-hidden className={iconSize} />
      {word}
    </span>
  )
}
