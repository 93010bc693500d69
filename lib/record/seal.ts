// The sealed drive record: the canonical form of one revision, its SHA-256 digest and the short
// verification code printed on the PDF. Defined in DEVELOPERS.md "Record revisions and verification";
// anyone holding the drive file, the score and the review decision can recompute the digest.
import { createHash } from "node:crypto"
import canonicalize from "canonicalize"

const SEAL_FORMAT = "straightaway.record/1"

export interface SealInput {
  driveId: string
  revision: number
  /** The drive file exactly as GET /api/drives/:id/file?format=drive gives it. */
  driveFile: unknown
  /** The score exactly as GET /api/drives/:id/score gives it. */
  score: unknown
  review: { decision: "approve" | "redo"; note: string } | null
}

/** JSON as it travels (undefined dropped, non-finite numbers as null), then RFC 8785 (JCS). */
export function canonicalJson(value: unknown): string {
  const text = canonicalize(JSON.parse(JSON.stringify(value ?? null)))
  if (text === undefined) throw new TypeError("nothing to canonicalize")
  return text
}

/**
 * The canonical record: a JCS object with the format, drive id, revision number, drive file, score and review.
 * `driveFileJson` is canonicalDriveFile(input.driveFile) when the caller has it already (one drive file, two digests).
 */
export function canonicalRecord(input: SealInput, driveFileJson = canonicalDriveFile(input.driveFile)): string {
  return canonicalObject(
    {
      format: SEAL_FORMAT,
      driveId: input.driveId.toLowerCase(),
      revision: input.revision,
      driveFile: null,
      score: input.score,
      review: input.review ? { decision: input.review.decision, note: input.review.note } : null,
    },
    { driveFile: driveFileJson },
  )
}

/**
 * RFC 8785 of a drive file. Same output as `canonicalJson(file)`; samples, tens of thousands of flat objects of
 * numbers, are written directly (keys in JCS order, numbers as ECMAScript writes them) instead of through the
 * generic canonicalizer, which takes seconds for a long drive. Anything unexpected goes the generic way.
 */
export function canonicalDriveFile(file: unknown): string {
  const samples =
    file && typeof file === "object" && !Array.isArray(file) ? (file as { samples?: unknown }).samples : undefined
  const fast = Array.isArray(samples) ? canonicalSamples(samples) : null
  return fast === null ? canonicalJson(file) : canonicalObject(file as Record<string, unknown>, { samples: fast })
}

const SAMPLE_KEYS = ["accuracy", "lat", "lon", "speed", "t"] // sorted by UTF-16 code units, as JCS sorts
const IS_SAMPLE_KEY: Record<string, true> = { accuracy: true, lat: true, lon: true, speed: true, t: true }

function canonicalSamples(samples: readonly unknown[]): string | null {
  for (const s of samples) {
    if (!s || typeof s !== "object" || Array.isArray(s)) return null
    for (const key in s) {
      const v = (s as Record<string, unknown>)[key]
      if (IS_SAMPLE_KEY[key] !== true || typeof v !== "number" || !Number.isFinite(v)) return null
    }
  }
  // Flat objects of finite numbers only: JSON.stringify with the keys in JCS order writes exactly RFC 8785
  // (no white space; numbers as ECMAScript writes them, -0 as 0), many times faster than the generic way.
  return JSON.stringify(samples, SAMPLE_KEYS)
}

/** A JCS object whose members are canonicalized, except those given already as canonical text in `written`. */
function canonicalObject(obj: Record<string, unknown>, written: Record<string, string>): string {
  const plain = JSON.parse(
    JSON.stringify(Object.fromEntries(Object.entries(obj).filter(([k]) => !(k in written)))),
  ) as Record<string, unknown>
  const keys = [...new Set([...Object.keys(plain), ...Object.keys(written)])].sort() // default sort: UTF-16 code units
  return `{${keys.map((k) => `${JSON.stringify(k)}:${k in written ? written[k] : canonicalJson(plain[k])}`).join(",")}}`
}

/** SHA-256 (FIPS 180-4) of UTF-8 text or bytes, lower-case hex. */
export function sha256Hex(data: string | Uint8Array): string {
  return createHash("sha256").update(data).digest("hex")
}

export function recordDigest(input: SealInput, driveFileJson?: string): string {
  return sha256Hex(canonicalRecord(input, driveFileJson))
}

// Crockford's base 32 (no I, L, O, U): read aloud and typed without mix-ups.
const CROCKFORD = "0123456789ABCDEFGHJKMNPQRSTVWXYZ"
const CODE_LENGTH = 12

/** The first 60 bits of the digest in Crockford base 32, grouped 4-4-4: `7KQ2-M9XD-44TB`. */
export function verificationCode(digestHex: string): string {
  if (!/^[0-9a-f]{64}$/.test(digestHex)) throw new RangeError("digest must be 64 hex digits")
  let bits = BigInt(`0x${digestHex.slice(0, 15)}`) // 15 hex digits = 60 bits
  let out = ""
  for (let i = 0; i < CODE_LENGTH; i++) {
    out = CROCKFORD[Number(bits & 31n)]! + out
    bits >>= 5n
  }
  return `${out.slice(0, 4)}-${out.slice(4, 8)}-${out.slice(8)}`
}

/**
 * What a person typed, as a code: case, spaces and dashes do not matter, and the letters Crockford reads
 * as digits (O -> 0, I and L -> 1) are taken as those digits. null when it cannot be a code.
 */
export function normalizeCode(input: string): string | null {
  const plain = input
    .toUpperCase()
    .replace(/[\s-]+/g, "")
    .replace(/O/g, "0")
    .replace(/[IL]/g, "1")
  if (plain.length !== CODE_LENGTH || [...plain].some((ch) => !CROCKFORD.includes(ch))) return null
  return `${plain.slice(0, 4)}-${plain.slice(4, 8)}-${plain.slice(8)}`
}
