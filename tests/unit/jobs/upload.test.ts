import { describe, expect, it } from "vitest"
import { isAllowedUploadType, sniffUploadType } from "@/lib/validation/upload"

const hex = (h: string) => Uint8Array.from(Buffer.from(h.replace(/\s/g, ""), "hex"))
const ascii = (s: string) => Uint8Array.from(Buffer.from(s, "latin1"))

describe("sniffUploadType", () => {
  // File signatures, all from memory (not in check-values.md): JPEG SOI marker FF D8 then a marker FF (ITU-T T.81);
  // PNG 89 50 4E 47 0D 0A 1A 0A (PNG spec / RFC 2083); WebP "RIFF" size "WEBP" (RFC 9649); PDF header "%PDF-"
  // (ISO 32000-1); HEIF an ISO-BMFF ftyp box with a brand such as heic or mif1 (ISO/IEC 23008-12).
  it.each([
    ["image/jpeg", hex("ffd8ffe000104a464946")],
    ["image/png", hex("89504e470d0a1a0a0000000d49484452")],
    ["image/webp", ascii("RIFF\u0024\u0000\u0000\u0000WEBPVP8 ")],
    ["application/pdf", ascii("%PDF-1.7\n")],
    ["image/heic", Uint8Array.from([...hex("00000018"), ...ascii("ftypheic"), 0, 0, 0, 0])],
  ])("knows %s", (type, bytes) => {
    expect(sniffUploadType(bytes)).toBe(type)
  })

  it("knows nothing else", () => {
    expect(sniffUploadType(ascii("GIF89a"))).toBeNull()
    expect(sniffUploadType(ascii("<html>"))).toBeNull()
    expect(sniffUploadType(hex("ffd8"))).toBeNull() // too short for a JPEG
    expect(sniffUploadType(Uint8Array.from([0, 0, 0, 0x18, ...ascii("ftypisom"), 0, 0, 0, 0]))).toBeNull() // an MP4
    expect(sniffUploadType(new Uint8Array())).toBeNull()
  })
})

describe("isAllowedUploadType", () => {
  it("takes photos and PDFs only", () => {
    expect(["image/jpeg", "image/png", "image/webp", "image/heic", "application/pdf"].every(isAllowedUploadType)).toBe(
      true,
    )
    expect(["image/gif", "image/svg+xml", "text/plain", "application/octet-stream"].some(isAllowedUploadType)).toBe(
      false,
    )
  })
})
