import { createHmac } from "node:crypto"
import { describe, expect, it } from "vitest"
import { hmacSha256Base64url, signShareToken, verifyShareToken } from "@/lib/share"

const SECRET = "unit-test-secret-0123456789"
const DRIVE = "3f2b8c4e-9a1d-4c6e-8b7a-1d2e3f4a5b6c"
const NOW = Date.UTC(2026, 5, 1, 12, 0, 0)
const DAY_MS = 86_400_000

describe("hmacSha256Base64url", () => {
  it("matches RFC 4231 test case 2 (key 'Jefe', 'what do ya want for nothing?')", () => {
    // RFC 4231 §4.3: HMAC-SHA-256 = 5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843
    const hex = Buffer.from(hmacSha256Base64url("Jefe", "what do ya want for nothing?"), "base64url").toString("hex")
    expect(hex).toBe("5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843")
  })
})

describe("share tokens", () => {
  it("verifies a token it signed and returns the drive and expiry", () => {
    const token = signShareToken(SECRET, DRIVE, NOW + DAY_MS)
    const check = verifyShareToken(SECRET, token, NOW)
    expect(check).toEqual({ ok: true, driveId: DRIVE, expiresAtMs: Math.floor((NOW + DAY_MS) / 1000) * 1000 })
  })

  it("signs drive id and expiry with HMAC-SHA256 of the app secret", () => {
    const token = signShareToken(SECRET, DRIVE, NOW + DAY_MS)
    const [id, exp, sig] = token.split(".")
    const expected = createHmac("sha256", SECRET).update(`share:${id}.${exp}`).digest("base64url")
    expect(sig).toBe(expected)
  })

  it("refuses a token whose expiry was changed", () => {
    const token = signShareToken(SECRET, DRIVE, NOW + DAY_MS)
    const [id, exp, sig] = token.split(".")
    const later = `${id}.${Number(exp) + 86_400 * 365}.${sig}`
    expect(verifyShareToken(SECRET, later, NOW)).toEqual({ ok: false, reason: "bad_signature" })
  })

  it("refuses a token moved to another drive", () => {
    const token = signShareToken(SECRET, DRIVE, NOW + DAY_MS)
    const other = token.replace(DRIVE, "3f2b8c4e-9a1d-4c6e-8b7a-1d2e3f4a5b6d")
    expect(verifyShareToken(SECRET, other, NOW)).toEqual({ ok: false, reason: "bad_signature" })
  })

  it("refuses a token with one signature character flipped", () => {
    const token = signShareToken(SECRET, DRIVE, NOW + DAY_MS)
    const last = token.at(-1)!
    const flipped = token.slice(0, -1) + (last === "A" ? "B" : "A")
    expect(verifyShareToken(SECRET, flipped, NOW).ok).toBe(false)
  })

  it("refuses a token signed with another secret", () => {
    const token = signShareToken("another-secret-0123456789", DRIVE, NOW + DAY_MS)
    expect(verifyShareToken(SECRET, token, NOW)).toEqual({ ok: false, reason: "bad_signature" })
  })

  it("refuses a token at and after its expiry, but not a second before", () => {
    const expiresAt = NOW + DAY_MS
    const token = signShareToken(SECRET, DRIVE, expiresAt)
    expect(verifyShareToken(SECRET, token, expiresAt - 1000).ok).toBe(true)
    expect(verifyShareToken(SECRET, token, expiresAt)).toEqual({ ok: false, reason: "expired" })
    expect(verifyShareToken(SECRET, token, expiresAt + DAY_MS)).toEqual({ ok: false, reason: "expired" })
  })

  it.each([
    "",
    "abc",
    `${DRIVE}.123`,
    `not-a-uuid.123.${"a".repeat(43)}`,
    `${DRIVE}.12x.${"a".repeat(43)}`,
    `${DRIVE}.1.2.3`,
    "x".repeat(500),
  ])("calls %j malformed", (token) => {
    expect(verifyShareToken(SECRET, token, NOW)).toEqual({ ok: false, reason: "malformed" })
  })

  it("will not sign a drive id that is not a UUID", () => {
    expect(() => signShareToken(SECRET, "../etc", NOW)).toThrow(RangeError)
  })

  it("refuses a token signed under an earlier share epoch as withdrawn, and accepts one of the current epoch", () => {
    const old = signShareToken(SECRET, DRIVE, NOW + DAY_MS)
    const current = signShareToken(SECRET, DRIVE, NOW + DAY_MS, 2)
    expect(verifyShareToken(SECRET, old, NOW, 2)).toEqual({ ok: false, reason: "withdrawn" })
    expect(verifyShareToken(SECRET, current, NOW, 2).ok).toBe(true)
    // a later epoch's token is not valid under an earlier one (withdrawal is never undone)
    expect(verifyShareToken(SECRET, current, NOW, 1)).toEqual({ ok: false, reason: "bad_signature" })
    // a forged signature stays a forgery whatever the epoch
    expect(verifyShareToken(SECRET, `${old.slice(0, -1)}${old.at(-1) === "A" ? "B" : "A"}`, NOW, 2).ok).toBe(false)
  })

  it("signs epoch n > 0 over the payload with the epoch appended", () => {
    const token = signShareToken(SECRET, DRIVE, NOW + DAY_MS, 3)
    const [id, exp, sig] = token.split(".")
    expect(sig).toBe(createHmac("sha256", SECRET).update(`share:${id}.${exp}.3`).digest("base64url"))
  })
})
