import { type Kysely, sql } from "kysely"

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("condition_profile")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("key", "text", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("sensor", "text")
    .addColumn("current_version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("archived", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("condition_profile_shop_key_uq", ["shop_id", "key"])
    .execute()

  await db.schema
    .createTable("condition_profile_version")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("profile_id", "uuid", (c) => c.notNull().references("condition_profile.id").onDelete("cascade"))
    .addColumn("version", "integer", (c) => c.notNull())
    .addColumn("settings", "jsonb", (c) => c.notNull())
    .addColumn("created_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("condition_profile_version_uq", ["profile_id", "version"])
    .execute()

  await db.schema
    .createTable("vehicle")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("vin", "text", (c) => c.notNull())
    .addColumn("year", "integer")
    .addColumn("make", "text")
    .addColumn("model", "text")
    .addColumn("plate", "text")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("vehicle_shop_vin_idx").on("vehicle").columns(["shop_id", "vin"]).execute()

  await db.schema
    .createTable("job")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("ro_number", "text", (c) => c.notNull())
    .addColumn("customer_name", "text", (c) => c.notNull())
    .addColumn("customer_email", "text")
    .addColumn("customer_phone", "text")
    .addColumn("vehicle_id", "uuid", (c) => c.notNull().references("vehicle.id"))
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("open")
        .check(sql`status in ('open','drive','review','complete','redo')`),
    )
    .addColumn("created_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("job_shop_ro_uq", ["shop_id", "ro_number"])
    .execute()
  await db.schema.createIndex("job_shop_created_idx").on("job").columns(["shop_id", "created_at"]).execute()

  await db.schema
    .createTable("job_task")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("job_id", "uuid", (c) => c.notNull().references("job.id").onDelete("cascade"))
    .addColumn("sensor", "text", (c) => c.notNull())
    .addColumn("method", "text", (c) => c.notNull())
    .addColumn("reason", "text", (c) => c.notNull())
    .addColumn("profile_id", "uuid", (c) => c.references("condition_profile.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("job_task_job_idx").on("job_task").column("job_id").execute()

  await db.schema
    .createTable("checklist")
    .addColumn("task_id", "uuid", (c) => c.primaryKey().references("job_task.id").onDelete("cascade"))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("data", "jsonb", (c) => c.notNull())
    .addColumn("completed_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("completed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()

  await db.schema
    .createTable("attachment")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("job_id", "uuid", (c) => c.notNull().references("job.id").onDelete("cascade"))
    .addColumn("task_id", "uuid", (c) => c.references("job_task.id").onDelete("set null"))
    .addColumn("filename", "text", (c) => c.notNull())
    .addColumn("content_type", "text", (c) => c.notNull())
    .addColumn("size", "integer", (c) => c.notNull())
    .addColumn("object_key", "text", (c) => c.notNull().unique())
    .addColumn("thumbnail_key", "text")
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("pending")
        .check(sql`status in ('pending','complete')`),
    )
    .addColumn("uploaded_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("completed_at", "timestamptz")
    .execute()
  await db.schema.createIndex("attachment_job_idx").on("attachment").column("job_id").execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of [
    "attachment",
    "checklist",
    "job_task",
    "job",
    "vehicle",
    "condition_profile_version",
    "condition_profile",
  ]) {
    await db.schema.dropTable(table).execute()
  }
}
