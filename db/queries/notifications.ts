import type { Db } from "../client"

const NOTIFICATION_PAGE_SIZE = 30

export async function insertNotification(
  db: Db,
  n: { shopId: string; userId: string; message: string; link: string | null },
) {
  return db
    .insertInto("notification")
    .values({ shop_id: n.shopId, user_id: n.userId, message: n.message, link: n.link })
    .returningAll()
    .executeTakeFirstOrThrow()
}

/** The person's latest notices, newest first, with how many are unread in all. */
export async function listNotifications(db: Db, userId: string, shopId: string) {
  const [rows, unread] = await Promise.all([
    db
      .selectFrom("notification")
      .select(["id", "message", "link", "read_at", "created_at"])
      .where("user_id", "=", userId)
      .where("shop_id", "=", shopId)
      .orderBy("created_at", "desc")
      .orderBy("id", "desc")
      .limit(NOTIFICATION_PAGE_SIZE)
      .execute(),
    db
      .selectFrom("notification")
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .where("user_id", "=", userId)
      .where("shop_id", "=", shopId)
      .where("read_at", "is", null)
      .executeTakeFirstOrThrow(),
  ])
  return { rows, unread: Number(unread.n) }
}

/** Marks the given notices (or all of them) read; only the person's own. Returns how many changed. */
export async function markNotificationsRead(db: Db, userId: string, shopId: string, ids: string[] | "all") {
  let q = db
    .updateTable("notification")
    .set({ read_at: new Date() })
    .where("user_id", "=", userId)
    .where("shop_id", "=", shopId)
    .where("read_at", "is", null)
  if (ids !== "all") {
    if (ids.length === 0) return 0
    q = q.where("id", "in", ids)
  }
  const res = await q.executeTakeFirst()
  return Number(res.numUpdatedRows)
}
