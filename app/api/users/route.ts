import { randomUUID } from "node:crypto"
import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { findUserByEmail, insertUser, listUsersInShop } from "@/db/queries/users"
import { hashPassword } from "@/lib/auth/password"
import { AppError } from "@/lib/errors"
import { newUserSchema } from "@/lib/validation/user"

export const GET = route(async () => {
  const { user } = await requireRole("admin")
  const users = await listUsersInShop(getDb(), user.shopId)
  return Response.json({ users: users.map(toJson) })
})

export const POST = route(async (req) => {
  const { user } = await requireRole("admin")
  const input = await parseJson(req, newUserSchema)
  const db = getDb()
  if (await findUserByEmail(db, input.email)) {
    throw new AppError("conflict", "Someone already signs in with that e-mail.", { email: "is already in use" })
  }
  const created = await insertUser(db, {
    id: randomUUID(),
    shop_id: user.shopId,
    email: input.email,
    name: input.name,
    role: input.role,
    password_hash: await hashPassword(input.password),
  })
  return Response.json({ user: toJson(created) }, { status: 201 })
})

export function toJson(u: {
  id: string
  email: string
  name: string
  role: string
  shop_id: string
  disabled: boolean
}) {
  return { id: u.id, email: u.email, name: u.name, role: u.role, shopId: u.shop_id, disabled: u.disabled }
}
