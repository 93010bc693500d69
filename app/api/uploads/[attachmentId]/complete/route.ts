import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { copyObject, deleteObject, getObjectBytes, getObjectPrefix, headObjectSize, storedKeyFor } from "@/app/_server/storage"
import { canHaveThumbnail, deleteAttachmentObjects, storeThumbnail } from "@/app/_server/thumbnails"
import { getDb } from "@/db/client"
import { deleteAttachment, findAttachmentInShop, markAttachmentComplete } from "@/db/queries/attachments"
import { attachmentJson } from "@/db/queries/jobs"
import { AppError, notFound } from "@/lib/errors"
import { MUST_DECODE_TYPES } from "@/lib/thumbnail"
import { countPdfPages } from "@/lib/validation/pdf-pages"
import { MAX_UPLOAD_BYTES, SNIFF_BYTES, sniffUploadType } from "@/lib/validation/upload"

/**
 * Accepts an uploaded file: copies it on the server to a key no upload address reaches, then checks that copy (size,
 * leading bytes, a photo that decodes, a PDF a PDF library opens with at least one page). Only the copy is served, so
 * a later PUT to the upload address changes nothing; the upload object itself is removed.
 */
export const POST = route<{ attachmentId: string }>(async (_req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { attachmentId } = await parseParams(params, z.object({ attachmentId: uuidParam }))
  const db = getDb()
  const a = (await findAttachmentInShop(db, attachmentId, user.shopId)) ?? notFound("That upload")
  if (a.status === "complete") return Response.json({ attachment: attachmentJson(a) })
  const uploadSize = await headObjectSize(a.object_key)
  if (uploadSize === null) throw new AppError("invalid_request", "The file has not arrived yet: upload it to the upload URL first.")
  const storedKey = storedKeyFor(a.object_key)
  const stored = { ...a, object_key: storedKey }
  const refuse = async (message: string) => {
    await Promise.all([deleteAttachmentObjects(a), deleteAttachmentObjects(stored)])
    await deleteAttachment(db, a.id, user.shopId)
    return new AppError("invalid_request", message, { file: message })
  }
  if (uploadSize > MAX_UPLOAD_BYTES) throw await refuse("The file is over 15 MB and was removed.")
  await copyObject(a.object_key, storedKey, a.content_type)
  // From here on only the copy is read: what is checked is what is served.
  const size = (await headObjectSize(storedKey)) ?? 0
  if (size > MAX_UPLOAD_BYTES) throw await refuse("The file is over 15 MB and was removed.")
  const found = size > 0 ? sniffUploadType(await getObjectPrefix(storedKey, SNIFF_BYTES)) : null
  if (found !== a.content_type) {
    throw await refuse(`The file's contents are ${found ? found : "not a photo or PDF"}, not ${a.content_type} as declared; it was removed.`)
  }
  if (a.content_type === "application/pdf" && (await countPdfPages(await getObjectBytes(storedKey))) === null) {
    throw await refuse(`${a.filename} starts like a PDF but does not open as one (damaged, cut short or something else inside); it was removed.`)
  }
  let thumbnailKey: string | null = null
  if (canHaveThumbnail(a.content_type)) {
    const thumb = await storeThumbnail(storedKey)
    if (thumb.ok) thumbnailKey = thumb.key
    // A photo that will not open is no evidence: say so now, while the technician can still take it again.
    // HEIC is kept without a preview, since the image library may simply lack its codec.
    else if (MUST_DECODE_TYPES.includes(a.content_type)) {
      throw await refuse(`${a.filename} starts like ${a.content_type} but the picture in it cannot be read (damaged or cut short); it was removed. Take or export the photo again.`)
    }
  }
  const done = await markAttachmentComplete(db, a.id, user.shopId, size, thumbnailKey, storedKey)
  await deleteObject(a.object_key).catch((error: unknown) => console.error("[straightaway] upload object %s was not removed", a.object_key, error))
  return Response.json({ attachment: attachmentJson(done) })
})
