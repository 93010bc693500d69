import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { findShopSettings, updateShopSettings } from "@/db/queries/shop-settings"
import { shopSettingsSchema } from "@/lib/validation/profile"

export const GET = route(async () => {
  const { user } = await requireRole()
  return Response.json({ settings: await findShopSettings(getDb(), user.shopId) })
})

export const PATCH = route(async (req) => {
  const { user } = await requireRole("admin")
  const changes = await parseJson(req, shopSettingsSchema)
  return Response.json({ settings: await updateShopSettings(getDb(), user.shopId, changes) })
})
