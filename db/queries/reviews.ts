import { sql } from "kysely"
import type { Db } from "../client"

export const REVIEW_PAGE_SIZE = 50

/**
 * Finished drives that need a second look and have had none: a verdict other than met, or any harsh event.
 * Oldest first; `cursor` is the last row's `finishedAt|id`.
 */
export async function listReviewQueue(db: Db, shopId: string, cursor?: { finishedAt: string; id: string }) {
  let q = db
    .selectFrom("drive")
    .innerJoin("score", "score.drive_id", "drive.id")
    .leftJoin("app_user as driver", "driver.id", "drive.driver_id")
    .leftJoin("job", (j) => j.onRef("job.id", "=", "drive.job_id").on("job.shop_id", "=", shopId))
    .select([
      "drive.id",
      "drive.job_id",
      "drive.task_id",
      "drive.vehicle_description",
      "drive.verdict",
      "drive.finished_at",
      "drive.created_at",
      "driver.name as driver_name",
      "job.ro_number",
      "score.result",
    ])
    .where("drive.shop_id", "=", shopId)
    .where("drive.status", "=", "finished")
    .where("drive.review_status", "is", null)
    .where((eb) =>
      eb.or([
        eb("drive.verdict", "!=", "met"),
        sql<boolean>`coalesce((score.result->'harshEvents'->>'accel')::int, 0) + coalesce((score.result->'harshEvents'->>'decel')::int, 0) > 0`,
      ]),
    )
    .orderBy("drive.finished_at", "asc")
    .orderBy("drive.id", "asc")
    .limit(REVIEW_PAGE_SIZE + 1)
  if (cursor) {
    q = q.where((eb) =>
      eb.or([
        eb("drive.finished_at", ">", new Date(cursor.finishedAt)),
        eb.and([eb("drive.finished_at", "=", new Date(cursor.finishedAt)), eb("drive.id", ">", cursor.id)]),
      ]),
    )
  }
  const rows = await q.execute()
  const page = rows.slice(0, REVIEW_PAGE_SIZE)
  const last = page.at(-1)
  const nextCursor = rows.length > REVIEW_PAGE_SIZE && last?.finished_at ? `${new Date(last.finished_at).toISOString()}|${last.id}` : null
  return { rows: page, nextCursor }
}

export function parseReviewCursor(cursor: string | undefined) {
  if (!cursor) return undefined
  const [finishedAt, id] = cursor.split("|")
  if (!finishedAt || !id || Number.isNaN(Date.parse(finishedAt)) || !/^[0-9a-f-]{36}$/i.test(id)) return null
  return { finishedAt, id }
}
