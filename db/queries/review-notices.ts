import type { Db } from "../client"

/** The shop's active leads who hear about drives waiting for review, with whether each wants an e-mail too. */
export function listReviewListeners(db: Db, shopId: string) {
  return db
    .selectFrom("app_user")
    .select(["id", "name", "email", "review_mail"])
    .where("shop_id", "=", shopId)
    .where("disabled", "=", false)
    .where("role", "=", "shop_lead")
    .orderBy("name")
    .execute()
}

export async function findReviewMail(db: Db, userId: string, shopId: string): Promise<boolean> {
  const row = await db
    .selectFrom("app_user")
    .select("review_mail")
    .where("id", "=", userId)
    .where("shop_id", "=", shopId)
    .executeTakeFirst()
  return row?.review_mail ?? false
}

export async function setReviewMail(db: Db, userId: string, shopId: string, on: boolean): Promise<boolean> {
  const row = await db
    .updateTable("app_user")
    .set({ review_mail: on })
    .where("id", "=", userId)
    .where("shop_id", "=", shopId)
    .returning("review_mail")
    .executeTakeFirst()
  return row?.review_mail ?? false
}
