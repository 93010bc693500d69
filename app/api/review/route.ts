import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseQuery, route } from "@/app/_server/route"
import { reviewQueuePage } from "@/app/_server/services/review"

const querySchema = z.object({ cursor: z.string().max(200).optional() })

export const GET = route(async (req) => {
  const { user } = await requireRole("shop_lead")
  const { cursor } = parseQuery(req, querySchema)
  return Response.json(await reviewQueuePage(user, cursor))
})
