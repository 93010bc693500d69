import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { emailRecord } from "@/app/_server/services/records"
import { getDb } from "@/db/client"
import { recordEmailSchema } from "@/lib/validation/review"
import { loadDriveFor, shopDriveId } from "@/app/_server/services/drives"

const params = z.object({ driveId: uuidParam })

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole("shop_lead")
  const { driveId } = await parseParams(ctx.params, params)
  const { to } = await parseJson(req, recordEmailSchema)
  const db = getDb()
  const drive = await loadDriveFor(db, shopDriveId(user, driveId), user, "see")
  await emailRecord(db, drive.id, user.shopId, to)
  return Response.json({ sent: true, to }, { status: 202 })
})
