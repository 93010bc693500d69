import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { deleteRoadModel } from "@/db/queries/roads"
import { findDatabaseTimeZone, findShopSettings, updateShopSettings } from "@/db/queries/shop-settings"
import { validationFailed } from "@/lib/errors"
import { shopSettingsSchema } from "@/lib/validation/profile"

export const GET = route(async () => {
  const { user } = await requireRole()
  return Response.json({ settings: await findShopSettings(getDb(), user.shopId) })
})

export const PATCH = route(async (req) => {
  const { user } = await requireRole("admin")
  const changes = await parseJson(req, shopSettingsSchema)
  if (changes.timeZone !== undefined) {
    // The browser's zone list and the database's can differ; a zone the database does not know would break
    // every query that reads times in it, so it is refused here and nothing is stored.
    const known = await findDatabaseTimeZone(getDb(), changes.timeZone)
    if (!known)
      validationFailed({
        timeZone: "is not a time zone the database knows; pick one from the list, such as America/Chicago",
      })
    changes.timeZone = known
  }
  const settings = await getDb()
    .transaction()
    .execute(async (trx) => {
      const next = await updateShopSettings(trx, user.shopId, changes)
      // Road knowledge off: the model goes with it (turning it on again starts from drives scored after).
      if (changes.roadKnowledge === false) await deleteRoadModel(trx, user.shopId)
      return next
    })
  return Response.json({ settings })
})
