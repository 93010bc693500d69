import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { findReviewMail, setReviewMail } from "@/db/queries/review-notices"
import { mySettingsSchema } from "@/lib/validation/me"

/** The signed-in person's own settings: for a lead, whether a drive waiting for review also comes by e-mail. */
export const GET = route(async () => {
  const { user } = await requireRole()
  return Response.json({ settings: { reviewMail: await findReviewMail(getDb(), user.id, user.shopId) } })
})

export const PATCH = route(async (req) => {
  const { user } = await requireRole("shop_lead")
  const { reviewMail } = await parseJson(req, mySettingsSchema)
  return Response.json({ settings: { reviewMail: await setReviewMail(getDb(), user.id, user.shopId, reviewMail) } })
})
