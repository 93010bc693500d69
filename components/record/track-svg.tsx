import { projectTrack, STATE_LABEL, type StretchState, type TimelinePoint } from "@/lib/record"
import { downsampleTimeline } from "@/lib/record/downsample"
import { cn } from "@/components/ui/cn"

const STROKE: Record<StretchState, string> = {
  qualifying: "stroke-signal-500",
  following: "stroke-teal-500",
  slow: "stroke-graphite-400",
  gap: "stroke-graphite-300 [stroke-dasharray:4_4]",
}
const SWATCH: Record<StretchState, string> = {
  qualifying: "bg-signal-500",
  following: "bg-teal-500",
  slow: "bg-graphite-400",
  gap: "bg-graphite-300",
}

/** The drive's track drawn from its samples (no map tiles), coloured by qualifying state, with a legend in words. */
export function TrackSvg({ timeline, className }: { timeline: TimelinePoint[]; className?: string }) {
  const width = 600
  const height = 360
  const paths = projectTrack(downsampleTimeline(timeline, 2000), width, height, 16)
  if (paths.length === 0)
    return <p className="text-sm text-graphite-600 dark:text-graphite-300">No positions to draw.</p>
  const start = paths[0]!.points[0]!
  const end = paths.at(-1)!.points.at(-1)!
  const present = [...new Set(paths.map((p) => p.state))]
  return (
    <figure className={cn("space-y-2", className)}>
      <svg
        viewBox={`0 0 ${width} ${height}`}
        role="img"
        aria-label="Track of the drive, coloured by state"
        className="h-auto w-full rounded-lg bg-graphite-50 dark:bg-asphalt-900"
        data-testid="track-svg"
      >
        {paths.map((p, i) => (
          <polyline
            key={i}
            points={p.points.map(([x, y]) => `${x},${y}`).join(" ")}
            fill="none"
            strokeWidth={p.state === "gap" ? 2 : 4}
            strokeLinecap="round"
            strokeLinejoin="round"
            className={STROKE[p.state]}
            data-state={p.state}
          />
        ))}
        <circle cx={start[0]} cy={start[1]} r={7} className="fill-white stroke-graphite-900" strokeWidth={3}>
          <title>Start</title>
        </circle>
        <rect x={end[0] - 6} y={end[1] - 6} width={12} height={12} className="fill-graphite-900 dark:fill-white">
          <title>End</title>
        </rect>
      </svg>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-graphite-700 dark:text-graphite-200">
        {present.map((s) => (
          <span key={s} className="inline-flex items-center gap-1.5">
            <span aria-hidden className={cn("inline-block h-1.5 w-5 rounded", SWATCH[s])} />
            {STATE_LABEL[s]}
          </span>
        ))}
        <span>○ start · ■ end</span>
      </figcaption>
    </figure>
  )
}
