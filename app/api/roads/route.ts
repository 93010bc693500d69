import { requireRole } from "@/app/_server/auth"
import { loadRoadsView } from "@/app/_server/roads"
import { parseQuery, route } from "@/app/_server/route"
import { getReadDb } from "@/db/client"
import { roadsQuery } from "@/lib/validation/roads"

/** The shop's road knowledge: cells (with corners) for the hour asked, and the best loops for that hour and day. */
export const GET = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const q = parseQuery(req, roadsQuery)
  return Response.json(await loadRoadsView(getReadDb(), user.shopId, q))
})
