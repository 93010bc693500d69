import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, parseQuery, route, uuidParam } from "@/app/_server/route"
import { getObjectBytes, getObjectStream } from "@/app/_server/storage"
import { getDb } from "@/db/client"
import { findAttachmentInShop } from "@/db/queries/attachments"
import { isCoDriverOnJob } from "@/db/queries/jobs"
import { notFound } from "@/lib/errors"
import { contentDisposition } from "@/lib/http/content-disposition"
import { THUMBNAIL_CONTENT_TYPE } from "@/lib/thumbnail"

const querySchema = z.object({ variant: z.enum(["thumbnail"], "must be thumbnail").optional() })

/**
 * The file itself, through the app: the checked type, `nosniff`, and `attachment` (the original is not re-encoded by
 * us, so it is never rendered inline from our origin), its name intact in `filename*`. `?variant=thumbnail` answers the stored JPEG thumbnail
 * from here (a few tens of kB, cacheable at this stable address); a file without one (a PDF, a HEIC photo the image
 * library could not open, an upload from before thumbnails) falls back to the file itself.
 */
export const GET = route<{ attachmentId: string }>(async (req, { params }) => {
  const { user } = await requireRole()
  const { attachmentId } = await parseParams(params, z.object({ attachmentId: uuidParam }))
  const { variant } = parseQuery(req, querySchema)
  const db = getDb()
  const a = await findAttachmentInShop(db, attachmentId, user.shopId)
  if (!a || a.status !== "complete") notFound("That file")
  if (user.role === "co_driver" && !(await isCoDriverOnJob(db, a.job_id, user.shopId, user.id))) notFound("That file")
  if (variant === "thumbnail" && a.thumbnail_key) {
    const bytes = await getObjectBytes(a.thumbnail_key).catch((error: unknown) => {
      console.error("[straightaway] thumbnail of %s could not be read; sending the file itself", a.id, error)
      return null
    })
    if (bytes) {
      return new Response(bytes as BodyInit, {
        headers: {
          "content-type": THUMBNAIL_CONTENT_TYPE,
          "x-content-type-options": "nosniff",
          "content-length": String(bytes.byteLength),
          // Private: the thumbnail is shop data. An attachment's thumbnail never changes once made.
          "cache-control": "private, max-age=86400",
        },
      })
    }
  }
  const file = await getObjectStream(a.object_key)
  return new Response(file.body, {
    headers: {
      "content-type": a.content_type,
      ...(file.length !== undefined ? { "content-length": String(file.length) } : {}),
      "content-disposition": contentDisposition("attachment", a.filename),
      "x-content-type-options": "nosniff",
      "content-security-policy": "default-src 'none'; sandbox",
      "cache-control": "private, no-store",
    },
  })
})
