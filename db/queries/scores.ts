import { sql } from "kysely"
import type { Score } from "@/lib/scoring/types"
import type { Db } from "../client"
import { selectInShop } from "./shop-scope"

/** Harsh accelerations plus decelerations of the stored score; the query must join `score` under that name. */
export const harshEventCountSql = sql<number>`coalesce((score.result->'harshEvents'->>'accel')::int, 0) + coalesce((score.result->'harshEvents'->>'decel')::int, 0)`

export async function findScore(db: Db, driveId: string, shopId: string): Promise<Score | undefined> {
  const row = await selectInShop(db, "score", shopId)
    .select("result")
    .where("drive_id", "=", driveId)
    .executeTakeFirst()
  return row?.result
}

export async function upsertScore(db: Db, driveId: string, shopId: string, score: Score) {
  const result = JSON.stringify(score)
  await db
    .insertInto("score")
    .values({ drive_id: driveId, shop_id: shopId, verdict: score.verdict, result })
    .onConflict((oc) => oc.column("drive_id").doUpdateSet({ verdict: score.verdict, result, scored_at: new Date() }))
    .execute()
}
