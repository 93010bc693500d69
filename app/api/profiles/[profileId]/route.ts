import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import {
  findCurrentProfileVersionById,
  insertProfileVersion,
  loadProfileDetail,
  updateProfileFields,
} from "@/db/queries/profiles"
import { resolveProfile } from "@/lib/drive-file"
import { notFound } from "@/lib/errors"
import { profileChangeSchema } from "@/lib/validation/profile"

const paramsSchema = z.object({ profileId: uuidParam })

export const GET = route<{ profileId: string }>(async (_req, { params }) => {
  const { user } = await requireRole()
  const { profileId } = await parseParams(params, paramsSchema)
  return Response.json((await loadProfileDetail(getDb(), profileId, user.shopId)) ?? notFound("That profile"))
})

/** Name, sensor and archived change in place; changed settings become a new version (old ones stay as they were). */
export const PATCH = route<{ profileId: string }>(async (req, { params }) => {
  const { user } = await requireRole("shop_lead")
  const { profileId } = await parseParams(params, paramsSchema)
  const changes = await parseJson(req, profileChangeSchema)
  const db = getDb()
  await db.transaction().execute(async (trx) => {
    const current = (await findCurrentProfileVersionById(trx, profileId, user.shopId)) ?? notFound("That profile")
    const { settings, roadTestChecks, ...fields } = changes
    if (Object.values(fields).some((v) => v !== undefined))
      await updateProfileFields(trx, profileId, user.shopId, fields)
    if (settings || roadTestChecks) {
      const next = settings ? resolveProfile(settings) : current.settings
      const checks = roadTestChecks ?? current.roadTestChecks
      if (
        JSON.stringify(next) !== JSON.stringify(current.settings) ||
        JSON.stringify(checks) !== JSON.stringify(current.roadTestChecks)
      ) {
        await insertProfileVersion(trx, profileId, user.shopId, next, user.id, checks)
      }
    }
  })
  return Response.json(await loadProfileDetail(db, profileId, user.shopId))
})
