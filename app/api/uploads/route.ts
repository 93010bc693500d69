import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { startUpload } from "@/app/_server/services/uploads"
import { uploadRequestSchema } from "@/lib/validation/upload"

/** A pending attachment of a job (or one of its tasks) and the presigned address to PUT the file to. */
export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const input = await parseJson(req, uploadRequestSchema)
  return Response.json(await startUpload(user, input), { status: 201 })
})
