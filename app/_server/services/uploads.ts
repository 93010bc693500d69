import "server-only"
// The upload workflow: a presigned address for a new file, the server-side check of what arrived (copied first to a
// key no upload address reaches, so what is checked is what is served), and serving the checked copy.
import { randomUUID } from "node:crypto"
import type { z } from "zod"
import type { SessionUser } from "@/lib/auth/lucia"
import {
  copyObject,
  deleteObject,
  getObjectBytes,
  getObjectPrefix,
  getObjectStream,
  headObjectSize,
  presignPut,
  storedKeyFor,
} from "@/app/_server/storage"
import { canHaveThumbnail, deleteAttachmentObjects, storeThumbnail } from "@/app/_server/thumbnails"
import { getDb } from "@/db/client"
import {
  deleteAttachment,
  findAttachmentInShop,
  insertPendingAttachment,
  markAttachmentComplete,
} from "@/db/queries/attachments"
import { attachmentJson, findJobInShop, findTaskInJob, isCoDriverOnJob } from "@/db/queries/jobs"
import { AppError, notFound, validationFailed } from "@/lib/errors"
import { contentDisposition } from "@/lib/http/content-disposition"
import { MUST_DECODE_TYPES, THUMBNAIL_CONTENT_TYPE } from "@/lib/thumbnail"
import { countPdfPages } from "@/lib/validation/pdf-pages"
import {
  ALLOWED_UPLOAD_TYPES,
  isAllowedUploadType,
  MAX_UPLOAD_BYTES,
  SNIFF_BYTES,
  sniffUploadType,
  type uploadRequestSchema,
} from "@/lib/validation/upload"

type UploadRequest = z.output<typeof uploadRequestSchema>

/** A pending attachment and the presigned address the phone PUTs the file to. */
export async function startUpload(user: SessionUser, input: UploadRequest) {
  if (input.size > MAX_UPLOAD_BYTES) {
    const mb = (input.size / 1024 / 1024).toFixed(1)
    throw new AppError("too_large", `${input.filename} is ${mb} MB; files up to 15 MB are taken.`, {
      size: "is over 15 MB",
    })
  }
  if (!isAllowedUploadType(input.contentType)) {
    validationFailed(
      { contentType: `must be one of ${ALLOWED_UPLOAD_TYPES.join(", ")}` },
      "Only photos (JPEG, PNG, WebP, HEIC) and PDFs can be attached.",
    )
  }
  const db = getDb()
  const job = (await findJobInShop(db, input.jobId, user.shopId)) ?? notFound("That job")
  if (input.taskId && !(await findTaskInJob(db, input.taskId, job.id, user.shopId))) notFound("That calibration")
  const id = randomUUID()
  const objectKey = `shops/${user.shopId}/jobs/${job.id}/${id}`
  await insertPendingAttachment(db, {
    id,
    shopId: user.shopId,
    jobId: job.id,
    taskId: input.taskId ?? null,
    filename: input.filename,
    contentType: input.contentType,
    size: input.size,
    objectKey,
    userId: user.id,
  })
  const uploadUrl = await presignPut(objectKey, input.contentType)
  return { attachmentId: id, uploadUrl, headers: { "Content-Type": input.contentType } }
}

/**
 * Accepts an uploaded file: copies it on the server to a key no upload address reaches, then checks that copy (size,
 * leading bytes, a photo that decodes, a PDF a PDF library opens with at least one page). Only the copy is served, so
 * a later PUT to the upload address changes nothing; the upload object itself is removed. A refused file is removed
 * with its row, and the answer says why.
 */
export async function completeUpload(user: SessionUser, attachmentId: string) {
  const db = getDb()
  const a = (await findAttachmentInShop(db, attachmentId, user.shopId)) ?? notFound("That upload")
  if (a.status === "complete") return attachmentJson(a)
  const uploadSize = await headObjectSize(a.object_key)
  if (uploadSize === null)
    throw new AppError("invalid_request", "The file has not arrived yet: upload it to the upload URL first.")
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
    const what = found ? found : "not a photo or PDF"
    throw await refuse(`The file's contents are ${what}, not ${a.content_type} as declared; it was removed.`)
  }
  if (a.content_type === "application/pdf" && (await countPdfPages(await getObjectBytes(storedKey))) === null) {
    throw await refuse(
      `${a.filename} starts like a PDF but does not open as one (damaged, cut short or something else inside); it was removed.`,
    )
  }
  let thumbnailKey: string | null = null
  if (canHaveThumbnail(a.content_type)) {
    const thumb = await storeThumbnail(storedKey)
    if (thumb.ok) thumbnailKey = thumb.key
    // A photo that will not open is no evidence: say so now, while the technician can still take it again.
    // HEIC is kept without a preview, since the image library may simply lack its codec.
    else if (MUST_DECODE_TYPES.includes(a.content_type)) {
      throw await refuse(
        `${a.filename} starts like ${a.content_type} but the picture in it cannot be read (damaged or cut short); it was removed. Take or export the photo again.`,
      )
    }
  }
  const done = await markAttachmentComplete(db, a.id, user.shopId, size, thumbnailKey, storedKey)
  await deleteObject(a.object_key).catch((error: unknown) =>
    console.error("[straightaway] upload object %s was not removed", a.object_key, error),
  )
  return attachmentJson(done)
}

/**
 * The file itself, through the app: the checked type, `nosniff`, and `attachment` (the original is not re-encoded by
 * us, so it is never rendered inline from our origin), its name intact in `filename*`. `thumbnail` answers the stored
 * JPEG thumbnail (a few tens of kB, cacheable at this stable address); a file without one (a PDF, a HEIC photo the
 * image library could not open, an upload from before thumbnails) falls back to the file itself.
 */
export async function attachmentResponse(
  user: SessionUser,
  attachmentId: string,
  variant?: "thumbnail",
): Promise<Response> {
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
}
