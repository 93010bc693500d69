import "server-only"
// The people workflows (admin): listing, adding with a password, and changes where disabling someone ends their
// sessions in the same transaction.
import { randomUUID } from "node:crypto"
import type { z } from "zod"
import { getDb } from "@/db/client"
import {
  deleteSessionsOfUser,
  findUserByEmail,
  insertUser,
  listUsersInShop,
  updateUserInShop,
} from "@/db/queries/users"
import type { SessionUser } from "@/lib/auth/lucia"
import { hashPassword } from "@/lib/auth/password"
import { refusedPersonChange } from "@/lib/auth/roles"
import { AppError, notFound } from "@/lib/errors"
import type { newUserSchema, userChangeSchema } from "@/lib/validation/user"

type PersonRow = { id: string; email: string; name: string; role: string; shop_id: string; disabled: boolean }

function personJson(u: PersonRow) {
  return { id: u.id, email: u.email, name: u.name, role: u.role, shopId: u.shop_id, disabled: u.disabled }
}

export async function listPeople(admin: SessionUser) {
  return (await listUsersInShop(getDb(), admin.shopId)).map(personJson)
}

export async function addPerson(admin: SessionUser, input: z.output<typeof newUserSchema>) {
  const db = getDb()
  if (await findUserByEmail(db, input.email)) {
    throw new AppError("conflict", "Someone already signs in with that e-mail.", { email: "is already in use" })
  }
  const created = await insertUser(db, {
    id: randomUUID(),
    shop_id: admin.shopId,
    email: input.email,
    name: input.name,
    role: input.role,
    password_hash: await hashPassword(input.password),
  })
  return personJson(created)
}

export async function changePerson(admin: SessionUser, userId: string, change: z.output<typeof userChangeSchema>) {
  const refused = refusedPersonChange(admin.id, userId, change)
  if (refused) throw new AppError("conflict", refused)
  const updated = await getDb()
    .transaction()
    .execute(async (trx) => {
      const row = await updateUserInShop(trx, userId, admin.shopId, change)
      if (row && change.disabled) await deleteSessionsOfUser(trx, row.id)
      return row
    })
  return personJson(updated ?? notFound("That person"))
}
