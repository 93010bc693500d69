// Big drives on the detail page: at most `max` points for the speed chart and the track, chosen with
// largest-triangle-three-buckets (Steinarsson 2013, "Downsampling Time Series for Visual Representation",
// University of Iceland), which keeps a series' peaks and dips, plus the edges of the bands (the first and
// last point of every run of one state), so the shaded qualifying and following stretches start and end
// where they do in the full data.
import type { TimelinePoint } from "./timeline"

/** Indices LTTB keeps out of `n` points with x(i), y(i), `threshold` of them (first and last included). */
export function lttbIndices(
  n: number,
  x: (i: number) => number,
  y: (i: number) => number,
  threshold: number,
): number[] {
  if (threshold >= n) return Array.from({ length: n }, (_, i) => i)
  if (threshold < 3) return n === 1 ? [0] : [0, n - 1]
  const out = [0]
  const every = (n - 2) / (threshold - 2)
  let a = 0
  for (let b = 0; b < threshold - 2; b++) {
    // The average of the next bucket is the third corner.
    const nextStart = Math.floor((b + 1) * every) + 1
    const nextEnd = Math.min(Math.floor((b + 2) * every) + 1, n)
    let avgX = 0
    let avgY = 0
    for (let j = nextStart; j < nextEnd; j++) {
      avgX += x(j)
      avgY += y(j)
    }
    const count = Math.max(nextEnd - nextStart, 1)
    avgX /= count
    avgY /= count
    const start = Math.floor(b * every) + 1
    const end = Math.floor((b + 1) * every) + 1
    const ax = x(a)
    const ay = y(a)
    let best = start
    let bestArea = -1
    for (let j = start; j < end; j++) {
      const area = Math.abs((ax - avgX) * (y(j) - ay) - (ax - x(j)) * (avgY - ay))
      if (area > bestArea) {
        bestArea = area
        best = j
      }
    }
    out.push(best)
    a = best
  }
  out.push(n - 1)
  return out
}

/**
 * At most `max` points of the timeline: the band edges (of the longest runs when there are more than half
 * of `max`), the rest by LTTB over speed against time. Points come back in time order.
 */
export function downsampleTimeline(points: readonly TimelinePoint[], max = 2000): TimelinePoint[] {
  const n = points.length
  if (n <= max) return [...points]
  const runs: Array<{ from: number; to: number }> = []
  for (let i = 0; i < n; i++) {
    if (i === 0 || points[i]!.state !== points[i - 1]!.state) runs.push({ from: i, to: i })
    else runs.at(-1)!.to = i
  }
  const edgeBudget = Math.floor(max / 2)
  const kept =
    runs.length * 2 <= edgeBudget
      ? runs
      : [...runs].sort((p, q) => q.to - q.from - (p.to - p.from)).slice(0, Math.floor(edgeBudget / 2))
  const keep = new Set<number>([0, n - 1])
  for (const r of kept) {
    keep.add(r.from)
    keep.add(r.to)
  }
  const lttb = lttbIndices(
    n,
    (i) => points[i]!.tS,
    (i) => points[i]!.speedMph ?? 0,
    max - keep.size,
  )
  for (const i of lttb) {
    if (keep.size >= max) break
    keep.add(i)
  }
  return [...keep].sort((a, b) => a - b).map((i) => points[i]!)
}
