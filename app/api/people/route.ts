import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseQuery, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { listActiveUsersInShopByRole } from "@/db/queries/users"
import { ROLES } from "@/lib/auth/roles"

/** Active people of the shop by role, e.g. the co-drivers a technician can name on a drive. */
export const GET = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { role } = parseQuery(req, z.object({ role: z.enum(ROLES).default("co_driver") }))
  const people = await listActiveUsersInShopByRole(getDb(), user.shopId, [role])
  return Response.json({ people })
})
