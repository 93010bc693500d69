import { type Kysely, sql } from "kysely"

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("drive")
    .addColumn("id", "uuid", (c) => c.primaryKey())
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("job_id", "uuid", (c) => c.references("job.id").onDelete("set null"))
    .addColumn("task_id", "uuid", (c) => c.references("job_task.id").onDelete("set null"))
    .addColumn("vehicle_description", "text")
    .addColumn("profile_version_id", "uuid", (c) => c.references("condition_profile_version.id").onDelete("set null"))
    .addColumn("profile", "jsonb", (c) => c.notNull())
    .addColumn("driver_id", "text", (c) => c.notNull().references("app_user.id"))
    .addColumn("co_driver_id", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("recording")
        .check(sql`status in ('recording','finished')`),
    )
    .addColumn("source", "text", (c) =>
      c
        .notNull()
        .defaultTo("recorder")
        .check(sql`source in ('recorder','import')`),
    )
    .addColumn("verdict", "text", (c) => c.check(sql`verdict in ('met','short','not_met','unverified')`))
    .addColumn("review_status", "text", (c) => c.check(sql`review_status in ('approved','redo')`))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("finished_at", "timestamptz")
    .execute()
  await db.schema.createIndex("drive_shop_created_idx").on("drive").columns(["shop_id", "created_at"]).execute()
  await db.schema.createIndex("drive_job_idx").on("drive").column("job_id").execute()

  await db.schema
    .createTable("sample")
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("shop_id", "uuid", (c) => c.notNull())
    .addColumn("t", "bigint", (c) => c.notNull())
    .addColumn("lat", "float8", (c) => c.notNull())
    .addColumn("lon", "float8", (c) => c.notNull())
    .addColumn("speed", "float8")
    .addColumn("accuracy", "float8")
    .addPrimaryKeyConstraint("sample_pk", ["drive_id", "t"])
    .execute()

  await db.schema
    .createTable("sample_batch")
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("batch_id", "text", (c) => c.notNull())
    .addColumn("shop_id", "uuid", (c) => c.notNull())
    .addColumn("accepted", "integer", (c) => c.notNull())
    .addColumn("duplicates", "integer", (c) => c.notNull())
    .addColumn("received_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint("sample_batch_pk", ["drive_id", "batch_id"])
    .execute()

  await db.schema
    .createTable("mark")
    .addColumn("id", "uuid", (c) => c.primaryKey())
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("shop_id", "uuid", (c) => c.notNull())
    .addColumn("t", "bigint", (c) => c.notNull())
    .addColumn("kind", "text", (c) => c.notNull())
    .addColumn("gap_ft", "float8")
    .addColumn("text", "text")
    .addColumn("created_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("mark_drive_idx").on("mark").columns(["drive_id", "t"]).execute()

  await db.schema
    .createTable("score")
    .addColumn("drive_id", "uuid", (c) => c.primaryKey().references("drive.id").onDelete("cascade"))
    .addColumn("shop_id", "uuid", (c) => c.notNull())
    .addColumn("verdict", "text", (c) => c.notNull())
    .addColumn("result", "jsonb", (c) => c.notNull())
    .addColumn("scored_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()

  await db.schema
    .createTable("review")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("decision", "text", (c) => c.notNull().check(sql`decision in ('approve','redo')`))
    .addColumn("note", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("reviewer_id", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("review_drive_idx").on("review").column("drive_id").execute()

  await db.schema
    .createTable("notification")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("user_id", "text", (c) => c.notNull().references("app_user.id").onDelete("cascade"))
    .addColumn("message", "text", (c) => c.notNull())
    .addColumn("link", "text")
    .addColumn("read_at", "timestamptz")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("notification_user_idx").on("notification").columns(["user_id", "created_at"]).execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["notification", "review", "score", "mark", "sample_batch", "sample", "drive"]) {
    await db.schema.dropTable(table).execute()
  }
}
