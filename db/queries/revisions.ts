import { sql } from "kysely"
import type { Score } from "@/lib/scoring/types"
import type { Db } from "../client"
import { personName, selectInShop } from "./shop-scope"
import type { RevisionCause, ReviewDecision, Verdict } from "../types"

export async function findLatestRevision(db: Db, driveId: string, shopId: string) {
  return selectInShop(db, "score_revision", shopId)
    .selectAll()
    .where("drive_id", "=", driveId)
    .orderBy("revision", "desc")
    .limit(1)
    .executeTakeFirst()
}

export interface NewRevision {
  driveId: string
  shopId: string
  revision: number
  cause: RevisionCause
  score: Score
  reviewDecision: ReviewDecision | null
  digest: string
  code: string
  createdBy: string | null
}

export async function insertRevision(db: Db, r: NewRevision) {
  return db
    .insertInto("score_revision")
    .values({
      drive_id: r.driveId,
      shop_id: r.shopId,
      revision: r.revision,
      cause: r.cause,
      verdict: r.score.verdict as Verdict,
      result: JSON.stringify(r.score),
      review_decision: r.reviewDecision,
      digest: r.digest,
      code: r.code,
      created_by: r.createdBy,
    })
    .returningAll()
    .executeTakeFirstOrThrow()
}

/** Every revision of the drive, newest first, with who caused it. */
export async function listRevisions(db: Db, driveId: string, shopId: string) {
  return selectInShop(db, "score_revision as r", shopId)
    .select([
      "r.id",
      "r.revision",
      "r.cause",
      "r.verdict",
      "r.result",
      "r.review_decision",
      "r.digest",
      "r.code",
      "r.created_at",
    ])
    .select((eb) => personName(db, eb.ref("r.created_by"), shopId).as("by_name"))
    .where("r.drive_id", "=", driveId)
    .orderBy("r.revision", "desc")
    .execute()
}

// ---- public verification: these read across shops on purpose (a code or a PDF's bytes are the key) ----

const PUBLIC_REVISION_COLUMNS = [
  "r.id",
  "r.drive_id",
  "r.shop_id",
  "r.revision",
  "r.verdict",
  "r.created_at",
  sql<number>`(select max(l.revision) from score_revision l where l.drive_id = r.drive_id)`.as("latest_revision"),
] as const

export async function findRevisionByCode(db: Db, code: string) {
  return db
    .selectFrom("score_revision as r")
    .select(PUBLIC_REVISION_COLUMNS)
    .where("r.code", "=", code)
    .executeTakeFirst()
}

export async function findRevisionByPdfHash(db: Db, pdfSha256: string) {
  return db
    .selectFrom("issued_record as i")
    .innerJoin("score_revision as r", "r.id", "i.revision_id")
    .select(PUBLIC_REVISION_COLUMNS)
    .where("i.pdf_sha256", "=", pdfSha256)
    .orderBy("i.issued_at", "desc")
    .limit(1)
    .executeTakeFirst()
}

export async function insertIssuedRecord(
  db: Db,
  v: {
    shopId: string
    driveId: string
    revisionId: string
    pdfSha256: string
    channel: "download" | "email" | "share"
  },
) {
  await db
    .insertInto("issued_record")
    .values({
      shop_id: v.shopId,
      drive_id: v.driveId,
      revision_id: v.revisionId,
      pdf_sha256: v.pdfSha256,
      channel: v.channel,
    })
    .execute()
}

export async function insertShareLink(
  db: Db,
  v: { tokenSha256: string; shopId: string; driveId: string; revision: number },
) {
  await db
    .insertInto("share_link")
    .values({ token_sha256: v.tokenSha256, shop_id: v.shopId, drive_id: v.driveId, revision: v.revision })
    .onConflict((oc) => oc.column("token_sha256").doNothing())
    .execute()
}

export async function findShareLink(db: Db, tokenSha256: string, driveId: string, shopId: string) {
  return selectInShop(db, "share_link", shopId)
    .select(["revision", "created_at"])
    .where("token_sha256", "=", tokenSha256)
    .where("drive_id", "=", driveId)
    .executeTakeFirst()
}

/** Active shop leads, who hear when a verdict changes after the finish. */
export async function listShopLeads(db: Db, shopId: string) {
  return selectInShop(db, "app_user", shopId)
    .select(["id", "name", "email"])
    .where("role", "=", "shop_lead")
    .where("disabled", "=", false)
    .execute()
}

// ---- verify throttling (per client address, like sign-in) ----

export async function countRecentVerifyAttempts(db: Db, clientAddress: string, windowSeconds: number) {
  const since = new Date(Date.now() - windowSeconds * 1000)
  return db
    .selectFrom("verify_attempt")
    .select([
      sql<number>`count(*)::int`.as("all"),
      sql<number>`count(*) filter (where not matched)::int`.as("unmatched"),
      sql<Date | null>`min(created_at)`.as("oldest"),
    ])
    .where("client_address", "=", clientAddress)
    .where("created_at", ">", since)
    .executeTakeFirstOrThrow()
}

export async function insertVerifyAttempt(db: Db, clientAddress: string, matched: boolean) {
  await db.insertInto("verify_attempt").values({ client_address: clientAddress, matched }).execute()
}
