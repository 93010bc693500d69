import { sql, type Expression, type SelectQueryBuilder, type UpdateQueryBuilder } from "kysely"
import type { Db } from "../client"
import type { Database } from "../types"

/** The tables that hold one shop's rows (a `shop_id` column). */
type ShopTable = { [T in keyof Database]: Database[T] extends { shop_id: unknown } ? T : never }[keyof Database]

/** The condition on the shop: `<table or alias>.shop_id = shopId`. */
function ofShop(from: string, shopId: string) {
  return sql<boolean>`${sql.ref(`${from.split(" as ").at(-1)!}.shop_id`)} = ${shopId}`
}

// The builders' types cannot be narrowed on a generic table name, so the condition is added to the builder seen
// as one of any shop table, and the builder is handed back with the type its table gave it: a condition adds no
// column and no table.

/**
 * The shop's rows of a table (optionally aliased: "score_revision as r"): where a shop-scoped read starts, so the
 * shop filter is written once and no read built on it can leave it out. Joins add their own shop condition.
 */
export function selectInShop<T extends ShopTable | `${ShopTable} as ${string}`>(db: Db, from: T, shopId: string) {
  const q = db.selectFrom(from)
  return (q as unknown as SelectQueryBuilder<Database, ShopTable, object>).where(
    ofShop(from, shopId),
  ) as unknown as typeof q
}

/** An update of the shop's rows of a table: the shop filter of every shop-scoped update, written once. */
export function updateInShop<T extends ShopTable>(db: Db, table: T, shopId: string) {
  const q = db.updateTable(table)
  return (q as unknown as UpdateQueryBuilder<Database, ShopTable, ShopTable, object>).where(
    ofShop(table, shopId),
  ) as unknown as typeof q
}

/**
 * The name of the shop's person an id column names (who made, saved, reviewed or logged a row), as a scalar subquery
 * to select `.as(...)`: null when the column is null or names no one of the shop, as a shop-scoped left join gives.
 */
export function personName(db: Db, id: Expression<string | null>, shopId: string) {
  return selectInShop(db, "app_user", shopId).select("app_user.name").where("app_user.id", "=", id)
}
