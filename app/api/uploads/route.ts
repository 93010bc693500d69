import { randomUUID } from "node:crypto"
import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { presignPut } from "@/app/_server/storage"
import { getDb } from "@/db/client"
import { insertPendingAttachment } from "@/db/queries/attachments"
import { findJobInShop, findTaskInJob } from "@/db/queries/jobs"
import { AppError, notFound, validationFailed } from "@/lib/errors"
import { ALLOWED_UPLOAD_TYPES, isAllowedUploadType, MAX_UPLOAD_BYTES, uploadRequestSchema } from "@/lib/validation/upload"

export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const input = await parseJson(req, uploadRequestSchema)
  if (input.size > MAX_UPLOAD_BYTES) {
    throw new AppError("too_large", `${input.filename} is ${(input.size / 1024 / 1024).toFixed(1)} MB; files up to 15 MB are taken.`, { size: "is over 15 MB" })
  }
  if (!isAllowedUploadType(input.contentType)) {
    validationFailed({ contentType: `must be one of ${ALLOWED_UPLOAD_TYPES.join(", ")}` }, "Only photos (JPEG, PNG, WebP, HEIC) and PDFs can be attached.")
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
  return Response.json({ attachmentId: id, uploadUrl, headers: { "Content-Type": input.contentType } }, { status: 201 })
})
