import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { withdrawShareLinks } from "@/db/queries/reviews"
import { insertShareLink } from "@/db/queries/revisions"
import { sealCurrentRecord } from "@/app/_server/record-seal"
import { env } from "@/lib/env"
import { AppError } from "@/lib/errors"
import { sha256Hex } from "@/lib/record/seal"
import { signShareToken } from "@/lib/share"
import { SHARE_DEFAULT_DAYS, shareSchema } from "@/lib/validation/review"
import { loadDriveFor, shopDriveId } from "@/app/_server/services/drives"

const params = z.object({ driveId: uuidParam })

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole("shop_lead")
  const { driveId } = await parseParams(ctx.params, params)
  const { expiresInDays = SHARE_DEFAULT_DAYS } = await parseJson(req, shareSchema)
  const drive = await loadDriveFor(getDb(), shopDriveId(user, driveId), user, "see")
  if (drive.status !== "finished") throw new AppError("conflict", "Share the record once the drive is finished.")
  const expiresAtMs = Date.now() + expiresInDays * 86_400_000
  // The token names the internal id: unique across the server, so the page finds the drive with no shop.
  const token = signShareToken(env().APP_SECRET, drive.id, expiresAtMs, drive.share_epoch)
  // The revision the link was made at, so the page can say when the record was revised after it.
  const latest = await sealCurrentRecord(getDb(), drive.id, user.shopId)
  await insertShareLink(getDb(), {
    tokenSha256: sha256Hex(token),
    shopId: user.shopId,
    driveId: drive.id,
    revision: latest?.revision ?? 0,
  })
  const url = `${env().APP_URL.replace(/\/$/, "")}/share/${token}`
  return Response.json(
    { url, token, expiresAt: new Date(Math.floor(expiresAtMs / 1000) * 1000).toISOString() },
    { status: 201 },
  )
})

/** Withdraws every link made so far for the drive (a link sent to the wrong person, say); new links work again. */
export const DELETE = route<{ driveId: string }>(async (_req, ctx) => {
  const { user } = await requireRole("shop_lead")
  const { driveId } = await parseParams(ctx.params, params)
  const db = getDb()
  const drive = await loadDriveFor(db, shopDriveId(user, driveId), user, "see")
  await withdrawShareLinks(db, drive.id, user.shopId)
  return new Response(null, { status: 204 })
})
