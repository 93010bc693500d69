import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { presignGet } from "@/app/_server/storage"
import { getDb } from "@/db/client"
import { findAttachmentInShop } from "@/db/queries/attachments"
import { isCoDriverOnJob } from "@/db/queries/jobs"
import { notFound } from "@/lib/errors"

// `?variant=thumbnail` serves the photo itself: thumbnails are scaled by the browser (no image library).
export const GET = route<{ attachmentId: string }>(async (_req, { params }) => {
  const { user } = await requireRole()
  const { attachmentId } = await parseParams(params, z.object({ attachmentId: uuidParam }))
  const db = getDb()
  const a = await findAttachmentInShop(db, attachmentId, user.shopId)
  if (!a || a.status !== "complete") notFound("That file")
  if (user.role === "co_driver" && !(await isCoDriverOnJob(db, a.job_id, user.shopId, user.id))) notFound("That file")
  const url = await presignGet(a.object_key, { filename: a.filename, contentType: a.content_type })
  return new Response(null, { status: 302, headers: { location: url, "cache-control": "private, no-store" } })
})
