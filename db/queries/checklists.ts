import { sql } from "kysely"
import type { Db } from "../client"
import { personName } from "./shop-scope"

/** Checklists of the shop with the name of whoever saved each one. */
function checklistQuery(db: Db, shopId: string) {
  return db
    .selectFrom("checklist as c")
    .select(["c.task_id", "c.data", "c.completed_by", "c.completed_at"])
    .select((eb) => personName(db, eb.ref("c.completed_by"), shopId).as("completed_by_name"))
    .where("c.shop_id", "=", shopId)
}

export function findChecklistForTask(db: Db, taskId: string, shopId: string) {
  return checklistQuery(db, shopId).where("c.task_id", "=", taskId).executeTakeFirst()
}

export function listChecklistsForTasks(db: Db, taskIds: string[], shopId: string) {
  if (taskIds.length === 0) return Promise.resolve([])
  return checklistQuery(db, shopId).where("c.task_id", "in", taskIds).execute()
}

/** Stores the whole checklist, stamped with who saved it and when (a later save replaces both). */
export function upsertChecklist(db: Db, taskId: string, shopId: string, data: Record<string, unknown>, userId: string) {
  return db
    .insertInto("checklist")
    .values({ task_id: taskId, shop_id: shopId, data: JSON.stringify(data), completed_by: userId })
    .onConflict((oc) =>
      oc
        .column("task_id")
        .doUpdateSet({ data: JSON.stringify(data), completed_by: userId, completed_at: sql`now()` })
        .where("checklist.shop_id", "=", shopId),
    )
    .returning(["task_id", "data", "completed_by", "completed_at"])
    .executeTakeFirst()
}
