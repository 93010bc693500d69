// The sealed drive record: the canonical form of one revision, its SHA-256 digest and the short
// verification code printed on the PDF. Defined in DEVELOPERS.md "Record revisions and verification";
// anyone holding the drive file, the score and the review decision can recompute the digest.
import { createHash } from "node:crypto"
import canonicalize from "canonicalize"

export const SEAL_FORMAT = "straightaway.record/1"

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

/** The canonical record: a JCS object with the format, drive id, revision number, drive file, score and review. */
export function canonicalRecord(input: SealInput): string {
  return canonicalJson({
    format: SEAL_FORMAT,
    driveId: input.driveId.toLowerCase(),
    revision: input.revision,
    driveFile: input.driveFile,
    score: input.score,
    review: input.review ? { decision: input.review.decision, note: input.review.note } : null,
  })
}

/** SHA-256 (FIPS 180-4) of UTF-8 text or bytes, lower-case hex. */
export function sha256Hex(data: string | Uint8Array): string {
  return createHash("sha256").update(data).digest("hex")
}

export function recordDigest(input: SealInput): string {
  return sha256Hex(canonicalRecord(input))
}

// Crockford's base 32 (no I, L, O, U): read aloud and typed without mix-ups.
const CROCKFORD = "0123456789ABCDEFGHJKMNPQRSTVWXYZ"
export const CODE_LENGTH = 12

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
  const plain = input.toUpperCase().replace(/[\s-]+/g, "").replace(/O/g, "0").replace(/[IL]/g, "1")
  if (plain.length !== CODE_LENGTH || [...plain].some((ch) => !CROCKFORD.includes(ch))) return null
  return `${plain.slice(0, 4)}-${plain.slice(4, 8)}-${plain.slice(8)}`
}
