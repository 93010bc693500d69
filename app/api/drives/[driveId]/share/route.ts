import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { env } from "@/lib/env"
import { AppError } from "@/lib/errors"
import { SHARE_DEFAULT_DAYS, signShareToken } from "@/lib/share"
import { shareSchema } from "@/lib/validation/review"
import { loadDriveFor } from "../../_service"

const params = z.object({ driveId: uuidParam })

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole("shop_lead")
  const { driveId } = await parseParams(ctx.params, params)
  const { expiresInDays = SHARE_DEFAULT_DAYS } = await parseJson(req, shareSchema)
  const drive = await loadDriveFor(getDb(), driveId, user, "see")
  if (drive.status !== "finished") throw new AppError("conflict", "Share the record once the drive is finished.")
  const expiresAtMs = Date.now() + expiresInDays * 86_400_000
  const token = signShareToken(env().APP_SECRET, drive.id, expiresAtMs)
  const url = `${env().APP_URL.replace(/\/$/, "")}/share/${token}`
  return Response.json({ url, token, expiresAt: new Date(Math.floor(expiresAtMs / 1000) * 1000).toISOString() }, { status: 201 })
})
