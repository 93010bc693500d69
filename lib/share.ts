import { createHmac, timingSafeEqual } from "node:crypto"

// A share link token: "<driveId>.<expiresAtSeconds>.<signature>", the signature being HMAC-SHA256 (RFC 2104,
// FIPS 180-4) keyed with the app secret over "share:<driveId>.<expiresAtSeconds>", base64url without padding.
// The token holds no data beyond the drive id and expiry; the drive is read fresh on every visit.

export const SHARE_DEFAULT_DAYS = 14
export const SHARE_MAX_DAYS = 90

export type ShareCheck =
  | { ok: true; driveId: string; expiresAtMs: number }
  | { ok: false; reason: "malformed" | "bad_signature" | "expired" }

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export function hmacSha256Base64url(secret: string | Uint8Array, message: string): string {
  return createHmac("sha256", secret).update(message, "utf8").digest("base64url")
}

function payload(driveId: string, expiresAtSeconds: number) {
  return `share:${driveId.toLowerCase()}.${expiresAtSeconds}`
}

export function signShareToken(secret: string, driveId: string, expiresAtMs: number): string {
  if (!UUID.test(driveId)) throw new RangeError("driveId must be a UUID")
  if (!Number.isFinite(expiresAtMs) || expiresAtMs <= 0) throw new RangeError("expiresAtMs must be a time")
  const expiresAtSeconds = Math.floor(expiresAtMs / 1000)
  const id = driveId.toLowerCase()
  return `${id}.${expiresAtSeconds}.${hmacSha256Base64url(secret, payload(id, expiresAtSeconds))}`
}

/** Checks the signature before the expiry, so a forged token never learns whether its date would pass. */
export function verifyShareToken(secret: string, token: string, nowMs: number): ShareCheck {
  if (typeof token !== "string" || token.length > 200) return { ok: false, reason: "malformed" }
  const parts = token.split(".")
  if (parts.length !== 3) return { ok: false, reason: "malformed" }
  const [driveId, expires, signature] = parts as [string, string, string]
  if (!UUID.test(driveId) || !/^\d{1,12}$/.test(expires) || !/^[A-Za-z0-9_-]{43}$/.test(signature)) {
    return { ok: false, reason: "malformed" }
  }
  const expiresAtSeconds = Number(expires)
  const expected = Buffer.from(hmacSha256Base64url(secret, payload(driveId, expiresAtSeconds)))
  const given = Buffer.from(signature)
  if (expected.length !== given.length || !timingSafeEqual(expected, given)) return { ok: false, reason: "bad_signature" }
  const expiresAtMs = expiresAtSeconds * 1000
  if (nowMs >= expiresAtMs) return { ok: false, reason: "expired" }
  return { ok: true, driveId: driveId.toLowerCase(), expiresAtMs }
}
