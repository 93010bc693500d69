import type { Db } from "../client"
import { selectInShop, updateInShop } from "./shop-scope"

/** The shop's active leads who hear about drives waiting for review, with whether each wants an e-mail too. */
export function listReviewListeners(db: Db, shopId: string) {
  return selectInShop(db, "app_user", shopId)
    .select(["id", "name", "email", "review_mail"])
    .where("disabled", "=", false)
    .where("role", "=", "shop_lead")
    .orderBy("name")
    .execute()
}

export async function findReviewMail(db: Db, userId: string, shopId: string): Promise<boolean> {
  const row = await selectInShop(db, "app_user", shopId)
    .select("review_mail")
    .where("id", "=", userId)
    .executeTakeFirst()
  return row?.review_mail ?? false
}

export async function setReviewMail(db: Db, userId: string, shopId: string, on: boolean): Promise<boolean> {
  const row = await updateInShop(db, "app_user", shopId)
    .set({ review_mail: on })
    .where("id", "=", userId)
    .returning("review_mail")
    .executeTakeFirst()
  return row?.review_mail ?? false
}
