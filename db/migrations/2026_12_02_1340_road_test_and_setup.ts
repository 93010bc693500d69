import { type Kysely, sql } from "kysely"

// Road tests (issue 13): what a drive is for, the road-test checks frozen at its start, check marks,
// road-test checks per condition profile version, and the static set-up record of a task.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("drive")
    .addColumn("kind", "text", (c) =>
      c
        .notNull()
        .defaultTo("learn")
        .check(sql`kind in ('learn','road_test','learn_and_road_test')`),
    )
    .addColumn("road_test", "jsonb")
    .execute()
  await db.schema
    .alterTable("mark")
    .addColumn("check_key", "text")
    .addColumn("result", "text", (c) => c.check(sql`result in ('pass','fail','not_equipped')`))
    .execute()
  await db.schema.alterTable("condition_profile_version").addColumn("road_test_checks", "jsonb").execute()

  await db.schema
    .createTable("setup_record")
    .addColumn("task_id", "uuid", (c) => c.primaryKey().references("job_task.id").onDelete("cascade"))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("job_id", "uuid", (c) => c.notNull().references("job.id").onDelete("cascade"))
    .addColumn("measurements", "jsonb", (c) => c.notNull())
    .addColumn("scan_result", "text", (c) => c.notNull().check(sql`scan_result in ('not_run','pass','fail')`))
    .addColumn("scan_notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("override_note", "text")
    .addColumn("override_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("override_at", "timestamptz")
    .addColumn("updated_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("setup_record_job_idx").on("setup_record").column("job_id").execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("setup_record").execute()
  await db.schema.alterTable("condition_profile_version").dropColumn("road_test_checks").execute()
  await db.schema.alterTable("mark").dropColumn("check_key").dropColumn("result").execute()
  await db.schema.alterTable("drive").dropColumn("kind").dropColumn("road_test").execute()
}
