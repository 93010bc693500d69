import { sql } from "kysely"
import type { Db } from "../client"
import { harshEventCountSql } from "./scores"

/** Finished, scored drives of the shop since a date, with what the numbers page needs from each. */
export async function listDrivesForNumbers(db: Db, shopId: string, since: Date) {
  return db
    .selectFrom("drive")
    .innerJoin("score", (j) => j.onRef("score.drive_id", "=", "drive.id").on("score.shop_id", "=", shopId))
    .leftJoin("app_user as driver", (j) => j.onRef("driver.id", "=", "drive.driver_id").on("driver.shop_id", "=", shopId))
    .leftJoin("condition_profile_version as pv", (j) => j.onRef("pv.id", "=", "drive.profile_version_id").on("pv.shop_id", "=", shopId))
    .leftJoin("condition_profile as p", (j) => j.onRef("p.id", "=", "pv.profile_id").on("p.shop_id", "=", shopId))
    .select([
      "drive.id",
      "drive.finished_at",
      "drive.verdict",
      "drive.review_status",
      "drive.driver_id",
      "driver.name as driver_name",
      "p.name as profile_name",
      sql<number | null>`(score.result->>'clearedAtSeconds')::float8`.as("cleared_at_seconds"),
      sql<number>`coalesce((score.result->>'durationSeconds')::float8, 0)`.as("duration_seconds"),
      sql<number>`coalesce((score.result->>'qualifyingSecondsBeforeClear')::float8, 0)`.as("qualifying_seconds"),
      sql<number>`coalesce((score.result->>'followingSecondsBeforeClear')::float8, 0)`.as("following_seconds"),
      harshEventCountSql.as("harsh_events"),
      sql<string[]>`coalesce((select array_agg(c->>'key') from jsonb_array_elements(score.result->'conditions') c where (c->>'met')::boolean is false), '{}')`.as(
        "unmet_conditions",
      ),
    ])
    .where("drive.shop_id", "=", shopId)
    .where("drive.status", "=", "finished")
    .where("drive.finished_at", ">=", since)
    .orderBy("drive.finished_at", "asc")
    .orderBy("drive.id", "asc")
    .limit(20_000)
    .execute()
}
