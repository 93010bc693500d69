import { sql } from "kysely"
import { isOutOfTolerance, type SetupInput } from "@/lib/setup"
import type { Db } from "../client"
import { personName } from "./shop-scope"

/** The shop's set-up records with the names of who last changed and who overrode them. */
function setupRecords(db: Db, shopId: string) {
  return db
    .selectFrom("setup_record as s")
    .selectAll("s")
    .select((eb) => [
      personName(db, eb.ref("s.override_by"), shopId).as("override_by_name"),
      personName(db, eb.ref("s.updated_by"), shopId).as("updated_by_name"),
    ])
    .where("s.shop_id", "=", shopId)
}

export function findSetupRecord(db: Db, taskId: string, shopId: string) {
  return setupRecords(db, shopId).where("s.task_id", "=", taskId).executeTakeFirst()
}
export type SetupRow = NonNullable<Awaited<ReturnType<typeof findSetupRecord>>>

export function listSetupRecordsForJob(db: Db, jobId: string, shopId: string) {
  return setupRecords(db, shopId).where("s.job_id", "=", jobId).execute()
}

/** New figures replace the old ones and withdraw any override: a lead looks again at what is now recorded. */
export async function upsertSetupRecord(
  db: Db,
  v: { taskId: string; jobId: string; shopId: string; userId: string; input: SetupInput },
) {
  const values = {
    measurements: JSON.stringify(v.input.measurements),
    scan_result: v.input.scanResult,
    scan_notes: v.input.scanNotes ?? "",
    override_note: null,
    override_by: null,
    override_at: null,
    updated_by: v.userId,
    updated_at: sql<Date>`now()`,
  }
  await db
    .insertInto("setup_record")
    .values({ task_id: v.taskId, job_id: v.jobId, shop_id: v.shopId, ...values })
    .onConflict((oc) => oc.column("task_id").doUpdateSet(values))
    .execute()
}

export async function setSetupOverride(db: Db, taskId: string, shopId: string, note: string, userId: string) {
  await db
    .updateTable("setup_record")
    .set({ override_note: note, override_by: userId, override_at: sql<Date>`now()` })
    .where("task_id", "=", taskId)
    .where("shop_id", "=", shopId)
    .execute()
}

export function setupJson(row: SetupRow) {
  const measurements = row.measurements
  const outOfTolerance = measurements.filter(isOutOfTolerance).length
  return {
    taskId: row.task_id,
    measurements: measurements.map((m) => ({ ...m, outOfTolerance: isOutOfTolerance(m) })),
    scanResult: row.scan_result,
    scanNotes: row.scan_notes,
    outOfTolerance,
    override: row.override_note ? { note: row.override_note, by: row.override_by_name, at: row.override_at } : null,
    /** Whether this set-up keeps the job's road test from starting. */
    blocksRoadTest: outOfTolerance > 0 && !row.override_note,
    updatedBy: row.updated_by_name,
    updatedAt: row.updated_at,
  }
}
