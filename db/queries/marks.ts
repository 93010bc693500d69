import type { ApiMark, Mark2 as Mark } from "@/lib/drive-file/schema"
import type { Insertable } from "kysely"
import type { Db } from "../client"
import { selectInShop } from "./shop-scope"
import type { MarkTable } from "../types"

/** A mark as its `mark` row (either file version's, or the API's); what the mark leaves out is stored as null. */
export function markRow(
  m: Mark,
  row: { id: string; driveId: string; shopId: string; createdBy?: string | null },
): Insertable<MarkTable> {
  return {
    id: row.id,
    drive_id: row.driveId,
    shop_id: row.shopId,
    t: m.t,
    kind: m.kind,
    gap_ft: m.gapFt ?? null,
    text: m.text ?? null,
    check_key: m.checkKey ?? null,
    result: m.result ?? null,
    created_by: row.createdBy ?? null,
  }
}

/** Stores marks by their client-made ids in one statement; an id seen before on this drive is a duplicate. */
export async function insertMarks(
  trx: Db,
  driveId: string,
  shopId: string,
  marks: readonly ApiMark[],
  createdBy: string | null,
): Promise<{ accepted: number; duplicates: number }> {
  if (marks.length === 0) return { accepted: 0, duplicates: 0 }
  const rows = await trx
    .insertInto("mark")
    .values(marks.map((m) => markRow(m, { id: m.id, driveId, shopId, createdBy })))
    .onConflict((oc) => oc.columns(["drive_id", "id"]).doNothing())
    .returning("id")
    .execute()
  return { accepted: rows.length, duplicates: marks.length - rows.length }
}

/** The drive's marks by time then arrival, with the columns every reader of them takes; each adds its own. */
export function selectDriveMarks(db: Db, driveId: string, shopId: string) {
  return selectInShop(db, "mark", shopId)
    .select(["id", "t", "kind", "gap_ft", "text"])
    .where("drive_id", "=", driveId)
    .orderBy("t", "asc")
    .orderBy("seq", "asc")
}

export async function listMarks(db: Db, driveId: string, shopId: string): Promise<Array<Mark & { id: string }>> {
  const rows = await selectDriveMarks(db, driveId, shopId).select(["check_key", "result"]).execute()
  return rows.map((r) => {
    const m: Mark & { id: string } = { id: r.id, t: r.t, kind: r.kind as Mark["kind"] }
    if (r.gap_ft !== null) m.gapFt = r.gap_ft
    if (r.text !== null) m.text = r.text
    if (r.check_key !== null) m.checkKey = r.check_key
    if (r.result !== null) m.result = r.result
    return m
  })
}
