import { createHash } from "node:crypto"
import { isUuid } from "@/lib/validation/uuid"

// A drive has two ids (DEVELOPERS.md "Drive ids: public per shop, internal across the server"):
// - its public id: the UUID people, addresses, the API, the recorder, files and e-mails use. The recorder makes
//   it offline; it is unique within the shop only, so two shops may hold a drive with the same public id;
// - its internal id (`drive.id`): the key every child table, lock, notice and cache uses, unique across the
//   server. It is a pure function of (shop, public id), so every way in maps the public id with the caller's
//   shop without asking the database, and a shop can never even name another shop's drive.
//
// The internal id is a UUID version 8 (RFC 9562 section 5.8, custom layout): the first 16 bytes of
// SHA-256 (FIPS 180-4) of the shop id's 16 bytes followed by the public id's 16 bytes, with the version
// nibble (byte 6, high 4 bits) set to 8 and the variant (byte 8, high 2 bits) set to binary 10.
// PostgreSQL computes the same with `drive_internal_id(shop_id, public_id)` (migration
// 2026_12_03_0100_drive_public_id), and a CHECK on `drive` holds every row to it.

function uuidBytes(uuid: string): Buffer {
  if (!isUuid(uuid)) throw new RangeError("not a UUID")
  return Buffer.from(uuid.replaceAll("-", ""), "hex")
}

/** The internal id of the shop's drive with this public id (lower case). */
export function internalDriveId(shopId: string, publicId: string): string {
  const digest = createHash("sha256")
    .update(Buffer.concat([uuidBytes(shopId), uuidBytes(publicId)]))
    .digest()
  const b = digest.subarray(0, 16)
  b[6] = (b[6]! & 0x0f) | 0x80
  b[8] = (b[8]! & 0x3f) | 0x80
  const hex = b.toString("hex")
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`
}
