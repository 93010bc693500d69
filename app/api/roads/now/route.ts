import { requireRole } from "@/app/_server/auth"
import { loadGoodRoadsNow } from "@/app/_server/roads"
import { route } from "@/app/_server/route"
import { getReadDb } from "@/db/client"

/** The recorder's "good roads now" line: the best loop for the shop's current hour and kind of day. */
export const GET = route(async () => {
  const { user } = await requireRole("technician", "shop_lead")
  return Response.json(await loadGoodRoadsNow(getReadDb(), user.shopId))
})
