import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { completeUpload } from "@/app/_server/services/uploads"

/** Accepts an uploaded file after checking the server's own copy of it (see completeUpload). */
export const POST = route<{ attachmentId: string }>(async (_req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { attachmentId } = await parseParams(params, z.object({ attachmentId: uuidParam }))
  return Response.json({ attachment: await completeUpload(user, attachmentId) })
})
