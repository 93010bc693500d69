import { randomUUID } from "node:crypto"
import { describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { isUuid } from "@/lib/validation/uuid"

const SHOP = "00000000-0000-4000-8000-000000000001"
const OTHER_SHOP = "00000000-0000-4000-8000-000000000002"
const PUBLIC = "6f1c2d3e-4b5a-4c6d-8e7f-8091a2b3c4d5"

/** Version nibble (RFC 9562 section 4.2: the high 4 bits of byte 6) and variant (section 4.1: byte 8's high bits). */
function layout(uuid: string) {
  const hex = uuid.replaceAll("-", "")
  return { version: parseInt(hex[12]!, 16), variantBits: parseInt(hex.slice(16, 18), 16) >> 6 }
}

describe("internalDriveId", () => {
  it("is SHA-256 of the shop's and the public id's 16 bytes, cut to 16 bytes with the version 8 layout", () => {
    // Computed independently with Python's hashlib:
    //   sha256(UUID(SHOP).bytes + UUID(PUBLIC).bytes) = f79288994b68e40e4276bf170e041a7a3d9d8b9381967a49facf41a2d7858524
    // first 16 bytes, byte 6 0xe4 -> 0x84 (version 8), byte 8 0x42 -> 0x82 (variant 10).
    expect(internalDriveId(SHOP, PUBLIC)).toBe("f7928899-4b68-840e-8276-bf170e041a7a")
  })

  it("gives the same id for the same shop and public id, whatever the case of the input", () => {
    expect(internalDriveId(SHOP, PUBLIC)).toBe(internalDriveId(SHOP, PUBLIC))
    expect(internalDriveId(SHOP.toUpperCase(), PUBLIC.toUpperCase())).toBe(internalDriveId(SHOP, PUBLIC))
  })

  it("differs between shops for the same public id, and between public ids in one shop", () => {
    expect(internalDriveId(OTHER_SHOP, PUBLIC)).not.toBe(internalDriveId(SHOP, PUBLIC))
    expect(internalDriveId(SHOP, "6f1c2d3e-4b5a-4c6d-8e7f-8091a2b3c4d6")).not.toBe(internalDriveId(SHOP, PUBLIC))
    // the two ids are not interchangeable: (a, b) and (b, a) are different drives
    expect(internalDriveId(PUBLIC, SHOP)).not.toBe(internalDriveId(SHOP, PUBLIC))
    // and an internal id is never the public id it came from
    expect(internalDriveId(SHOP, PUBLIC)).not.toBe(PUBLIC)
  })

  it("always has version 8 and the RFC 9562 variant, in PostgreSQL's lower-case text form", () => {
    const seen = new Set<string>()
    for (let i = 0; i < 500; i++) {
      const id = internalDriveId(randomUUID(), randomUUID())
      expect(isUuid(id)).toBe(true)
      expect(id).toBe(id.toLowerCase())
      expect(layout(id)).toEqual({ version: 8, variantBits: 0b10 })
      seen.add(id)
    }
    expect(seen.size).toBe(500)
  })

  it("refuses anything that is not a UUID", () => {
    expect(() => internalDriveId(SHOP, "not-a-uuid")).toThrow(RangeError)
    expect(() => internalDriveId("", PUBLIC)).toThrow(RangeError)
  })
})
