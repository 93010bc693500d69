import type { DriveFile, Mark, Profile, Sample } from "@/lib/drive-file"

export const T0 = Date.UTC(2026, 0, 1, 10, 0, 0)

/** Samples 1 s apart (unless stepS says otherwise) carrying the given device speeds (m/s), heading north. */
export function samplesWithSpeeds(
  speeds: readonly (number | null)[],
  opts: { startS?: number; stepS?: number; lat0?: number; lon?: number; accuracy?: number } = {},
): Sample[] {
  const { startS = 0, stepS = 1, lat0 = 44, lon = -92.5, accuracy = 5 } = opts
  let lat = lat0
  return speeds.map((speed, i) => {
    const s: Sample = { t: T0 + Math.round((startS + i * stepS) * 1000), lat, lon, accuracy }
    if (speed !== null) s.speed = speed
    lat += ((speed ?? 20) * stepS) / 111_000
    return s
  })
}

/** A mark at `s` seconds after T0. */
export function mark(s: number, kind: Mark["kind"], extra: Partial<Mark> = {}): Mark {
  return { t: T0 + Math.round(s * 1000), kind, ...extra } as Mark
}

export function drive(samples: Sample[], marks: Mark[] = [], profile?: Profile): DriveFile {
  return { format: "straightaway.drive/1", ...(profile ? { profile } : {}), samples, marks }
}

/** n+1 samples at 1 s spacing, all at one device speed. */
export function steady(n: number, speedMps: number, startS = 0): Sample[] {
  return samplesWithSpeeds(
    Array.from({ length: n + 1 }, () => speedMps),
    { startS },
  )
}
