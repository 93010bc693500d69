import type { Db } from "../client"
import type { NewAppUser, Role } from "../types"

const PUBLIC_COLUMNS = ["id", "email", "name", "role", "shop_id", "disabled", "created_at"] as const

export function findUserByEmail(db: Db, email: string) {
  return db.selectFrom("app_user").selectAll().where("email", "=", email.trim().toLowerCase()).executeTakeFirst()
}

export function findUserInShop(db: Db, id: string, shopId: string) {
  return db
    .selectFrom("app_user")
    .select(PUBLIC_COLUMNS)
    .where("id", "=", id)
    .where("shop_id", "=", shopId)
    .executeTakeFirst()
}

export function listUsersInShop(db: Db, shopId: string) {
  return db.selectFrom("app_user").select(PUBLIC_COLUMNS).where("shop_id", "=", shopId).orderBy("name").execute()
}

export function listActiveUsersInShopByRole(db: Db, shopId: string, roles: Role[]) {
  return db
    .selectFrom("app_user")
    .select(["id", "name", "role"])
    .where("shop_id", "=", shopId)
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
  return db
    .updateTable("app_user")
    .set(changes)
    .where("id", "=", id)
    .where("shop_id", "=", shopId)
    .returning(PUBLIC_COLUMNS)
    .executeTakeFirst()
}

export function deleteSessionsOfUser(db: Db, userId: string) {
  return db.deleteFrom("user_session").where("user_id", "=", userId).execute()
}
