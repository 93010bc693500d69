import "server-only"
import sharp from "sharp"
import {
  THUMBNAIL_CONTENT_TYPE,
  THUMBNAIL_JPEG_QUALITY,
  THUMBNAIL_MAX_PX,
  THUMBNAIL_SOURCE_TYPES,
  thumbnailKeyFor,
  thumbnailSize,
} from "@/lib/thumbnail"
import { deleteObject, getObjectBytes, putObject } from "./storage"

// Every input is a different photo, so libvips' operation cache would only hold memory.
sharp.cache(false)

export type Thumbnail = { bytes: Uint8Array; widthPx: number; heightPx: number }

/**
 * A JPEG thumbnail of a photo: EXIF orientation applied, transparency on white, no metadata kept (sharp writes
 * none unless asked, so location and camera tags stay behind). Throws when the bytes do not decode; a file cut
 * short counts as not decoding ("truncated"), harmless encoder warnings do not.
 */
async function makeThumbnail(bytes: Uint8Array, maxPx = THUMBNAIL_MAX_PX): Promise<Thumbnail> {
  const input = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  const meta = await sharp(input, { failOn: "truncated" }).metadata()
  if (!meta.width || !meta.height) throw new Error("the image has no size")
  const size = thumbnailSize(meta.width, meta.height, meta.orientation, maxPx)
  const { data, info } = await sharp(input, { failOn: "truncated" })
    .rotate()
    .resize(size.widthPx, size.heightPx, { fit: "fill" })
    .flatten({ background: "#ffffff" })
    .jpeg({ quality: THUMBNAIL_JPEG_QUALITY, mozjpeg: true })
    .toBuffer({ resolveWithObject: true })
  return {
    bytes: new Uint8Array(data.buffer, data.byteOffset, data.byteLength),
    widthPx: info.width,
    heightPx: info.height,
  }
}

export type StoredThumbnail = { ok: true; key: string; thumbnail: Thumbnail } | { ok: false; reason: string }

/** Reads an uploaded photo, makes its thumbnail and stores it beside it. `ok: false` when the photo does not decode. */
export async function storeThumbnail(objectKey: string): Promise<StoredThumbnail> {
  const original = await getObjectBytes(objectKey)
  let thumbnail: Thumbnail
  try {
    thumbnail = await makeThumbnail(original)
  } catch (error) {
    return { ok: false, reason: error instanceof Error ? error.message : String(error) }
  }
  const key = thumbnailKeyFor(objectKey)
  await putObject(key, thumbnail.bytes, THUMBNAIL_CONTENT_TYPE)
  return { ok: true, key, thumbnail }
}

export function canHaveThumbnail(contentType: string) {
  return THUMBNAIL_SOURCE_TYPES.includes(contentType)
}

/** Removes an attachment's object and its thumbnail (by the fixed key too, in case the row never got to name it). */
export async function deleteAttachmentObjects(a: { object_key: string; thumbnail_key: string | null }) {
  const keys = new Set([a.object_key, thumbnailKeyFor(a.object_key), ...(a.thumbnail_key ? [a.thumbnail_key] : [])])
  await Promise.all([...keys].map((key) => deleteObject(key)))
}

/**
 * A photo's bytes for the drive record PDF: its stored thumbnail, or for an upload made before thumbnails existed
 * one scaled in memory, or the original when even that fails (the PDF then says it could not be read).
 */
export async function recordPhotoBytes(p: {
  id: string
  object_key: string
  thumbnail_key: string | null
  content_type: string
}) {
  if (p.thumbnail_key) {
    try {
      return { contentType: THUMBNAIL_CONTENT_TYPE, bytes: await getObjectBytes(p.thumbnail_key) }
    } catch (error) {
      console.error("[straightaway] thumbnail of photo %s could not be read; scaling the original", p.id, error)
    }
  }
  const original = await getObjectBytes(p.object_key)
  try {
    return { contentType: THUMBNAIL_CONTENT_TYPE, bytes: (await makeThumbnail(original)).bytes }
  } catch {
    return { contentType: p.content_type, bytes: original }
  }
}
