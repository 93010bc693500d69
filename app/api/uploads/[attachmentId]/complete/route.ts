import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { getObjectPrefix, headObjectSize } from "@/app/_server/storage"
import { canHaveThumbnail, deleteAttachmentObjects, storeThumbnail } from "@/app/_server/thumbnails"
import { getDb } from "@/db/client"
import { deleteAttachment, findAttachmentInShop, markAttachmentComplete } from "@/db/queries/attachments"
import { attachmentJson } from "@/db/queries/jobs"
import { AppError, notFound } from "@/lib/errors"
import { MUST_DECODE_TYPES } from "@/lib/thumbnail"
import { MAX_UPLOAD_BYTES, SNIFF_BYTES, sniffUploadType } from "@/lib/validation/upload"

export const POST = route<{ attachmentId: string }>(async (_req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { attachmentId } = await parseParams(params, z.object({ attachmentId: uuidParam }))
  const db = getDb()
  const a = (await findAttachmentInShop(db, attachmentId, user.shopId)) ?? notFound("That upload")
  if (a.status === "complete") return Response.json({ attachment: attachmentJson(a) })
  const size = await headObjectSize(a.object_key)
  if (size === null) throw new AppError("invalid_request", "The file has not arrived yet: upload it to the upload URL first.")
  const refuse = async (message: string) => {
    await deleteAttachmentObjects(a)
    await deleteAttachment(db, a.id, user.shopId)
    return new AppError("invalid_request", message, { file: message })
  }
  if (size > MAX_UPLOAD_BYTES) throw await refuse("The file is over 15 MB and was removed.")
  const found = size > 0 ? sniffUploadType(await getObjectPrefix(a.object_key, SNIFF_BYTES)) : null
  if (found !== a.content_type) {
    throw await refuse(`The file's contents are ${found ? found : "not a photo or PDF"}, not ${a.content_type} as declared; it was removed.`)
  }
  let thumbnailKey: string | null = null
  if (canHaveThumbnail(a.content_type)) {
    const thumb = await storeThumbnail(a.object_key)
    if (thumb.ok) thumbnailKey = thumb.key
    // A photo that will not open is no evidence: say so now, while the technician can still take it again.
    // HEIC is kept without a preview, since the image library may simply lack its codec.
    else if (MUST_DECODE_TYPES.includes(a.content_type)) {
      throw await refuse(`${a.filename} starts like ${a.content_type} but the picture in it cannot be read (damaged or cut short); it was removed. Take or export the photo again.`)
    }
  }
  return Response.json({ attachment: attachmentJson(await markAttachmentComplete(db, a.id, user.shopId, size, thumbnailKey)) })
})
