// How the server stores a sample (table `sample`, migration 2026_12_02_1540_partitioned_samples): whole
// numbers in the narrowest types that keep what a phone measures, so a sample with its key costs under
// 100 bytes (README "Scaling out"):
//   lat, lon   int4, 1e-7 degree (1.1 cm of latitude; lon 180 = 1.8e9 fits int4)
//   speed      int4, mm/s       (0.0005 m/s at most from the value sent)
//   accuracy   int4, mm
// Larger than int4 holds (2,147,483.647 m/s or m) is stored as that largest value: no vehicle goes that
// fast, and an accuracy radius that wide is dropped by every profile (maxAccuracyM).
// Every stored sample is rounded once, here, before it is scored or stored: the recorder's batches (the
// live scorer too), imports, seeds. What reads back is exactly storedSample(sent), so a drive's stored score
// and the score of its exported file are the same computation on the same numbers. A value with at most 7
// decimals (degrees) or 3 decimals (m/s, m) reads back exactly as sent.
import type { Sample } from "./schema"

export const DEGREE_SCALE = 1e7
export const MILLI_SCALE = 1e3
export const INT4_MAX = 2_147_483_647

/** Degrees as stored: round half up to 1e-7 degree (never -0). */
export function encodeDegrees(deg: number): number {
  return Math.round(deg * DEGREE_SCALE) + 0
}

/** m/s or m as stored: round half up to 1/1000, at most INT4_MAX; null stays null. */
export function encodeMillis(x: number | null | undefined): number | null {
  if (x === null || x === undefined) return null
  return Math.min(Math.round(x * MILLI_SCALE), INT4_MAX) + 0
}

/** A sample as read back from its stored integers (null speed or accuracy left out, as listSamples does). */
export function decodeSample(
  t: number,
  lat: number,
  lon: number,
  speed: number | null,
  accuracy: number | null,
): Sample {
  const s: Sample = { t, lat: lat / DEGREE_SCALE, lon: lon / DEGREE_SCALE }
  if (speed !== null) s.speed = speed / MILLI_SCALE
  if (accuracy !== null) s.accuracy = accuracy / MILLI_SCALE
  return s
}

/** The sample exactly as the database will give it back. */
export function storedSample(s: Sample): Sample {
  return decodeSample(s.t, encodeDegrees(s.lat), encodeDegrees(s.lon), encodeMillis(s.speed), encodeMillis(s.accuracy))
}

/** The columns of a batch as the insert sends them (one array per column, unnest() makes the rows). */
export function encodeSampleColumns(samples: readonly Sample[]) {
  const n = samples.length
  const t = new Array<number>(n)
  const lat = new Array<number>(n)
  const lon = new Array<number>(n)
  const speed = new Array<number | null>(n)
  const accuracy = new Array<number | null>(n)
  for (let i = 0; i < n; i++) {
    const s = samples[i]!
    t[i] = s.t
    lat[i] = encodeDegrees(s.lat)
    lon[i] = encodeDegrees(s.lon)
    speed[i] = encodeMillis(s.speed)
    accuracy[i] = encodeMillis(s.accuracy)
  }
  return { t, lat, lon, speed, accuracy }
}
