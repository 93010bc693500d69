// The hot path of parseDriveFile (import, /api/score, the CLI): a drive file of 36,000 samples is checked
// in one plain loop instead of 36,000 zod object parses. It only ever says yes to a file that
// driveFileSchema accepts, and then returns what zod would return; anything else (a problem to report, or
// a shape it does not handle) gets null and goes through zod, which names the problem in its usual words
// (`samples[3].lat: must be between -90 and 90`). Marks and the profile, a few entries, always go through
// zod. So the file is checked exactly as strictly as by the schema; tests/unit/drive-file/fast-check.test.ts
// compares the two on generated good and broken files.
import { z } from "zod"
import { DRIVE_FORMAT, markSchema, profileSchema, type DriveFile, type Sample } from "./schema"

const marksSchema = z.array(markSchema)

export function isPlainObject(x: unknown): x is Record<string, unknown> {
  return typeof x === "object" && x !== null && !Array.isArray(x)
}

/** A sample as sampleSchema accepts and outputs it, or null. Reuses the object when it has no other keys. */
function checkSample(s: unknown): Sample | null {
  if (!isPlainObject(s)) return null
  const { t, lat, lon, speed, accuracy } = s
  if (typeof t !== "number" || !Number.isSafeInteger(t) || t < 0) return null
  if (typeof lat !== "number" || !(lat >= -90 && lat <= 90)) return null
  if (typeof lon !== "number" || !(lon >= -180 && lon <= 180)) return null
  let keys = 3
  if (speed !== undefined) {
    if (speed !== null && (typeof speed !== "number" || !(speed >= 0 && speed < Infinity))) return null
    keys++
  } else if ("speed" in s) return null
  if (accuracy !== undefined) {
    if (accuracy !== null && (typeof accuracy !== "number" || !(accuracy >= 0 && accuracy < Infinity))) return null
    keys++
  } else if ("accuracy" in s) return null
  let n = 0
  for (const _ in s) n++
  if (n === keys && Object.getPrototypeOf(s) === Object.prototype) return s as Sample
  const out: Sample = { t, lat, lon }
  if (speed !== undefined) out.speed = speed as number | null
  if (accuracy !== undefined) out.accuracy = accuracy as number | null
  return out
}

/**
 * An array of samples as z.array(sampleSchema) outputs it, or null (then zod decides, and names the problem).
 * The array itself is reused when every sample is.
 */
export function fastCheckSamples(samples: unknown[]): Sample[] | null {
  const n = samples.length
  let out: Sample[] | null = null
  for (let i = 0; i < n; i++) {
    const s = samples[i]
    const checked = checkSample(s)
    if (checked === null) return null
    if (checked !== s) {
      out ??= samples.slice(0, i) as Sample[]
    }
    if (out) out.push(checked)
  }
  if (!out && !(Object.getPrototypeOf(samples) === Array.prototype)) out = [...(samples as Sample[])]
  return out ?? (samples as Sample[])
}

export function fastParseDriveFile(input: unknown): DriveFile | null {
  if (!isPlainObject(input) || input.format !== DRIVE_FORMAT) return null
  const { samples, marks, profile } = input
  if (!Array.isArray(samples) || !Array.isArray(marks)) return null
  let profileOut: DriveFile["profile"]
  if (profile !== undefined) {
    const p = profileSchema.safeParse(profile)
    if (!p.success) return null
    profileOut = p.data
  } else if ("profile" in input) return null
  const m = marksSchema.safeParse(marks)
  if (!m.success) return null
  const checked = fastCheckSamples(samples)
  if (!checked) return null
  const file: DriveFile = { format: DRIVE_FORMAT, samples: checked, marks: m.data }
  if (profile !== undefined) file.profile = profileOut
  return file
}
