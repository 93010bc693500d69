import type { Db } from "../client"
import type { NewAppUser, Role } from "../types"
import { selectInShop, updateInShop } from "./shop-scope"

const PUBLIC_COLUMNS = ["id", "email", "name", "role", "shop_id", "disabled", "created_at"] as const

export function findUserByEmail(db: Db, email: string) {
  return db.selectFrom("app_user").selectAll().where("email", "=", email.trim().toLowerCase()).executeTakeFirst()
}

export function findUserInShop(db: Db, id: string, shopId: string) {
  return selectInShop(db, "app_user", shopId).select(PUBLIC_COLUMNS).where("id", "=", id).executeTakeFirst()
}

export function listUsersInShop(db: Db, shopId: string) {
  return selectInShop(db, "app_user", shopId).select(PUBLIC_COLUMNS).orderBy("name").execute()
}

export function listActiveUsersInShopByRole(db: Db, shopId: string, roles: Role[]) {
  return selectInShop(db, "app_user", shopId)
    .select(["id", "name", "role"])
    .where("disabled", "=", false)
    .where("role", "in", roles)
    .orderBy("name")
    .execute()
}

export function insertUser(db: Db, user: NewAppUser) {
  return db
    .insertInto("app_user")
    .values({ ...user, email: user.email.trim().toLowerCase() })
    .returning(PUBLIC_COLUMNS)
    .executeTakeFirstOrThrow()
}

export function updateUserInShop(
  db: Db,
  id: string,
  shopId: string,
  changes: { role?: Role; disabled?: boolean; name?: string },
) {
  return updateInShop(db, "app_user", shopId)
    .set(changes)
    .where("id", "=", id)
    .returning(PUBLIC_COLUMNS)
    .executeTakeFirst()
}

export function deleteSessionsOfUser(db: Db, userId: string) {
  return db.deleteFrom("user_session").where("user_id", "=", userId).execute()
}
