import { type Kysely, sql } from "kysely"

// The sealed record: every change of a finished drive's record is a numbered revision with a SHA-256 digest
// (DEVELOPERS.md "Record revisions and verification"); every PDF issued keeps the hash of its bytes; share
// links remember the revision they were made at; the public verify route counts attempts per address.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("score_revision")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("revision", "integer", (c) => c.notNull().check(sql`revision >= 1`))
    .addColumn("cause", "text", (c) =>
      c
        .notNull()
        .check(
          sql`cause in ('finish','import','late_samples','late_marks','mark_removed','refinish','review','resealed')`,
        ),
    )
    .addColumn("verdict", "text", (c) => c.notNull().check(sql`verdict in ('met','short','not_met','unverified')`))
    .addColumn("result", "jsonb", (c) => c.notNull())
    .addColumn("review_decision", "text", (c) => c.check(sql`review_decision in ('approve','redo')`))
    .addColumn("digest", "text", (c) => c.notNull())
    .addColumn("code", "text", (c) => c.notNull().unique())
    .addColumn("created_by", "text", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("score_revision_drive_revision_key", ["drive_id", "revision"])
    .execute()

  await db.schema
    .createTable("issued_record")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("revision_id", "uuid", (c) => c.notNull().references("score_revision.id").onDelete("cascade"))
    .addColumn("pdf_sha256", "text", (c) => c.notNull())
    .addColumn("channel", "text", (c) => c.notNull().check(sql`channel in ('download','email','share')`))
    .addColumn("issued_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("issued_record_pdf_sha256_idx").on("issued_record").column("pdf_sha256").execute()

  await db.schema
    .createTable("share_link")
    .addColumn("token_sha256", "text", (c) => c.primaryKey())
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("revision", "integer", (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()

  await db.schema
    .createTable("verify_attempt")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("client_address", "text", (c) => c.notNull())
    .addColumn("matched", "boolean", (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema
    .createIndex("verify_attempt_address_idx")
    .on("verify_attempt")
    .columns(["client_address", "created_at"])
    .execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["verify_attempt", "share_link", "issued_record", "score_revision"])
    await db.schema.dropTable(table).execute()
}
