import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, parseQuery, route, uuidParam } from "@/app/_server/route"
import { attachmentResponse } from "@/app/_server/services/uploads"

const querySchema = z.object({ variant: z.enum(["thumbnail"], "must be thumbnail").optional() })

/** The checked file (or `?variant=thumbnail`), served through the app as an attachment with `nosniff`. */
export const GET = route<{ attachmentId: string }>(async (req, { params }) => {
  const { user } = await requireRole()
  const { attachmentId } = await parseParams(params, z.object({ attachmentId: uuidParam }))
  const { variant } = parseQuery(req, querySchema)
  return attachmentResponse(user, attachmentId, variant)
})
