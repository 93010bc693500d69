/** Thumbnails of photo evidence: sized for a job page on mobile data and for the drive record PDF's photo cells. */

/** Long side in pixels. The record's photo cell is about 164 pt (2.3 in) wide, so 320 px prints at about 140 ppi. */
export const THUMBNAIL_MAX_PX = 320
export const THUMBNAIL_JPEG_QUALITY = 75
export const THUMBNAIL_CONTENT_TYPE = "image/jpeg"

/** Photo types a thumbnail is made for. HEIC is tried too, but the image library may lack its codec. */
export const THUMBNAIL_SOURCE_TYPES: readonly string[] = ["image/jpeg", "image/png", "image/webp", "image/heic"]

/** Types whose undecodable bytes refuse the upload (the codec is always there, so failure means a damaged file). */
export const MUST_DECODE_TYPES: readonly string[] = ["image/jpeg", "image/png", "image/webp"]

/** The thumbnail's object key, next to the original's so one prefix holds both. */
export function thumbnailKeyFor(objectKey: string) {
  return `${objectKey}.thumb.jpg`
}

/** EXIF orientations 5 to 8 turn the picture a quarter turn, so stored width and height trade places (EXIF 2.32, tag 0x0112). */
export function isQuarterTurn(orientation: number | undefined) {
  return orientation !== undefined && orientation >= 5 && orientation <= 8
}

/**
 * The thumbnail's size: the picture as it should be seen (EXIF orientation applied) scaled so its long side is at
 * most `maxPx`, keeping the aspect ratio. Never enlarges; each side is at least 1 px.
 */
export function thumbnailSize(
  widthPx: number,
  heightPx: number,
  orientation?: number,
  maxPx = THUMBNAIL_MAX_PX,
): { widthPx: number; heightPx: number } {
  if (![widthPx, heightPx, maxPx].every((v) => Number.isInteger(v) && v > 0)) {
    throw new RangeError("thumbnailSize: width, height and maxPx must be positive whole numbers of pixels")
  }
  const [w, h] = isQuarterTurn(orientation) ? [heightPx, widthPx] : [widthPx, heightPx]
  const scale = Math.min(1, maxPx / Math.max(w, h))
  return { widthPx: Math.max(1, Math.round(w * scale)), heightPx: Math.max(1, Math.round(h * scale)) }
}
