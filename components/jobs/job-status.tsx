import { CircleCheck, CircleDot, ClipboardList, RotateCcw, Route } from "lucide-react"
import { cn } from "@/components/ui/cn"
import { JOB_STATUS_LABEL, type JobStatus } from "@/lib/validation/job"

const LOOK: Record<JobStatus, { icon: typeof CircleDot; className: string }> = {
  open: { icon: CircleDot, className: "bg-graphite-100 text-graphite-800 dark:bg-asphalt-700 dark:text-graphite-100" },
  drive: { icon: Route, className: "bg-signal-300 text-graphite-950" },
  review: { icon: ClipboardList, className: "bg-teal-300 text-graphite-950" },
  redo: { icon: RotateCcw, className: "border-2 border-signal-500 text-graphite-900 dark:text-signal-300" },
  complete: { icon: CircleCheck, className: "bg-graphite-800 text-white dark:bg-graphite-200 dark:text-graphite-900" },
}

/** A job's status as a word with an icon (never colour alone). */
export function JobStatusBadge({ status }: { status: string }) {
  const look = LOOK[status as JobStatus] ?? LOOK.open
  const Icon = look.icon
  return (
    <span
      className={cn(
        "inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-sm font-semibold whitespace-nowrap",
        look.className,
      )}
    >
      <Icon aria-hidden className="size-4" />
      {JOB_STATUS_LABEL[status as JobStatus] ?? status}
    </span>
  )
}
