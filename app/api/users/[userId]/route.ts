import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { deleteSessionsOfUser, updateUserInShop } from "@/db/queries/users"
import { AppError, notFound } from "@/lib/errors"
import { userChangeSchema } from "@/lib/validation/user"
import { toJson } from "../route"

export const PATCH = route<{ userId: string }>(async (req, { params }) => {
  const { user } = await requireRole("admin")
  const { userId } = await parseParams(params, z.object({ userId: z.string().min(1).max(64) }))
  const changes = await parseJson(req, userChangeSchema)
  if (userId === user.id && (changes.disabled || (changes.role && changes.role !== "admin"))) {
    throw new AppError("conflict", "You cannot disable yourself or take away your own admin role.")
  }
  const db = getDb()
  const updated = await db.transaction().execute(async (trx) => {
    const row = await updateUserInShop(trx, userId, user.shopId, changes)
    if (row && changes.disabled) await deleteSessionsOfUser(trx, row.id)
    return row
  })
  if (!updated) notFound("That person")
  return Response.json({ user: toJson(updated) })
})
