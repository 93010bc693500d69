import { type Kysely, sql } from "kysely"

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("shop")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("settings", "jsonb", (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()

  await db.schema
    .createTable("app_user")
    .addColumn("id", "text", (c) => c.primaryKey())
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("email", "text", (c) => c.notNull().unique())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("role", "text", (c) => c.notNull().check(sql`role in ('technician','co_driver','shop_lead','admin')`))
    .addColumn("password_hash", "text", (c) => c.notNull())
    .addColumn("disabled", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("app_user_shop_idx").on("app_user").column("shop_id").execute()

  await db.schema
    .createTable("user_session")
    .addColumn("id", "text", (c) => c.primaryKey())
    .addColumn("user_id", "text", (c) => c.notNull().references("app_user.id").onDelete("cascade"))
    .addColumn("expires_at", "timestamptz", (c) => c.notNull())
    .execute()
  await db.schema.createIndex("user_session_user_idx").on("user_session").column("user_id").execute()

  await db.schema
    .createTable("sign_in_failure")
    .addColumn("id", "bigserial", (c) => c.primaryKey())
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("client_address", "text", (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema
    .createIndex("sign_in_failure_email_idx")
    .on("sign_in_failure")
    .columns(["email", "created_at"])
    .execute()
  await db.schema
    .createIndex("sign_in_failure_address_idx")
    .on("sign_in_failure")
    .columns(["client_address", "created_at"])
    .execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("sign_in_failure").execute()
  await db.schema.dropTable("user_session").execute()
  await db.schema.dropTable("app_user").execute()
  await db.schema.dropTable("shop").execute()
}
