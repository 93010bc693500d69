import type { Sample } from "@/lib/drive-file/schema"

/**
 * A batch of samples as one array per column, for a multi-row insert whatever the batch size: unnest() turns
 * the arrays into rows (a VALUES list would hit PostgreSQL's 65,535-parameter limit at ~9,000 rows).
 */
export function sampleColumns(samples: readonly Sample[]) {
  const n = samples.length
  const t = new Array<number>(n)
  const lat = new Array<number>(n)
  const lon = new Array<number>(n)
  const speed = new Array<number | null>(n)
  const accuracy = new Array<number | null>(n)
  for (let i = 0; i < n; i++) {
    const s = samples[i]!
    t[i] = s.t
    lat[i] = s.lat
    lon[i] = s.lon
    speed[i] = s.speed ?? null
    accuracy[i] = s.accuracy ?? null
  }
  return { t, lat, lon, speed, accuracy }
}
