import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import {
  findProfileByKey,
  insertProfile,
  isDuplicateProfileKey,
  listProfiles,
  loadProfileDetail,
  profileVersionJson,
} from "@/db/queries/profiles"
import { resolveProfile } from "@/lib/drive-file"
import { AppError } from "@/lib/errors"
import { keyFromName, newProfileSchema } from "@/lib/validation/profile"

export const GET = route(async () => {
  const { user } = await requireRole()
  const rows = await listProfiles(getDb(), user.shopId)
  return Response.json({
    profiles: rows.map((r) => ({
      ...profileVersionJson(r),
      archived: r.archived,
      versionCreatedAt: r.versionCreatedAt,
    })),
  })
})

export const POST = route(async (req) => {
  const { user } = await requireRole("shop_lead")
  const input = await parseJson(req, newProfileSchema)
  const key = input.key ?? keyFromName(input.name)
  const db = getDb()
  const taken = () =>
    new AppError("conflict", `A profile with the key ${key} already exists.`, {
      key: "is already used by another profile",
    })
  if (await findProfileByKey(db, key, user.shopId)) throw taken()
  try {
    const id = await db.transaction().execute((trx) =>
      insertProfile(trx, {
        shopId: user.shopId,
        key,
        name: input.name,
        sensor: input.sensor ?? null,
        settings: resolveProfile(input.settings),
        userId: user.id,
        roadTestChecks: input.roadTestChecks,
      }),
    )
    return Response.json(await loadProfileDetail(db, id, user.shopId), { status: 201 })
  } catch (error) {
    if (isDuplicateProfileKey(error)) throw taken()
    throw error
  }
})
