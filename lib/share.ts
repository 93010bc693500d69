import { createHmac, timingSafeEqual } from "node:crypto"
import { isUuid } from "@/lib/validation/uuid"

// A share link token: "<driveId>.<expiresAtSeconds>.<signature>", the signature being HMAC-SHA256 (RFC 2104,
// FIPS 180-4) keyed with the app secret over "share:<driveId>.<expiresAtSeconds>", base64url without padding;
// once a drive's links have been withdrawn (its share epoch n > 0), over "share:<driveId>.<expiresAtSeconds>.<n>".
// The token holds no data beyond the drive id and expiry; the drive is read fresh on every visit.

export type ShareCheck =
  | { ok: true; driveId: string; expiresAtMs: number }
  | { ok: false; reason: "malformed" | "bad_signature" | "expired" | "withdrawn" }

export function hmacSha256Base64url(secret: string | Uint8Array, message: string): string {
  return createHmac("sha256", secret).update(message, "utf8").digest("base64url")
}

function payload(driveId: string, expiresAtSeconds: number, epoch: number) {
  return `share:${driveId.toLowerCase()}.${expiresAtSeconds}${epoch > 0 ? `.${epoch}` : ""}`
}

/** The drive id a well-formed token names (not yet trusted), to look up the drive's share epoch. */
export function shareTokenDriveId(token: string): string | null {
  if (typeof token !== "string" || token.length > 200) return null
  const id = token.split(".")[0] ?? ""
  return isUuid(id) ? id.toLowerCase() : null
}

export function signShareToken(secret: string, driveId: string, expiresAtMs: number, epoch = 0): string {
  if (!isUuid(driveId)) throw new RangeError("driveId must be a UUID")
  if (!Number.isFinite(expiresAtMs) || expiresAtMs <= 0) throw new RangeError("expiresAtMs must be a time")
  const expiresAtSeconds = Math.floor(expiresAtMs / 1000)
  const id = driveId.toLowerCase()
  return `${id}.${expiresAtSeconds}.${hmacSha256Base64url(secret, payload(id, expiresAtSeconds, epoch))}`
}

/**
 * Checks the signature before the expiry, so a forged token never learns whether its date would pass.
 * `epoch` is the drive's share epoch: a token signed under an earlier one was withdrawn by the shop.
 */
export function verifyShareToken(secret: string, token: string, nowMs: number, epoch = 0): ShareCheck {
  if (typeof token !== "string" || token.length > 200) return { ok: false, reason: "malformed" }
  const parts = token.split(".")
  if (parts.length !== 3) return { ok: false, reason: "malformed" }
  const [driveId, expires, signature] = parts as [string, string, string]
  if (!isUuid(driveId) || !/^\d{1,12}$/.test(expires) || !/^[A-Za-z0-9_-]{43}$/.test(signature)) {
    return { ok: false, reason: "malformed" }
  }
  const expiresAtSeconds = Number(expires)
  const given = Buffer.from(signature)
  const signedUnder = (e: number) => {
    const expected = Buffer.from(hmacSha256Base64url(secret, payload(driveId, expiresAtSeconds, e)))
    return expected.length === given.length && timingSafeEqual(expected, given)
  }
  if (!signedUnder(epoch)) {
    for (let e = epoch - 1; e >= 0; e--) if (signedUnder(e)) return { ok: false, reason: "withdrawn" }
    return { ok: false, reason: "bad_signature" }
  }
  const expiresAtMs = expiresAtSeconds * 1000
  if (nowMs >= expiresAtMs) return { ok: false, reason: "expired" }
  return { ok: true, driveId: driveId.toLowerCase(), expiresAtMs }
}
