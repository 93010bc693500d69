import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { decideReview } from "@/app/_server/services/review"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { reviewSchema } from "@/lib/validation/review"
import { driveJson, loadDriveFor, shopDriveId } from "@/app/_server/services/drives"

const params = z.object({ driveId: uuidParam })

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole("shop_lead")
  const { driveId } = await parseParams(ctx.params, params)
  const input = await parseJson(req, reviewSchema)
  const db = getDb()
  const drive = await loadDriveFor(db, shopDriveId(user, driveId), user, "see")
  const { drive: reviewed, review } = await decideReview(db, drive, user, input)
  return Response.json({
    drive: driveJson(reviewed),
    review: {
      id: review.id,
      decision: review.decision,
      note: review.note,
      reviewerId: review.reviewer_id,
      createdAt: review.created_at,
    },
  })
})
