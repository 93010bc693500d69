import { sql } from "kysely"
import type { TimeCursor } from "@/lib/validation/drive"
import type { Db } from "../client"
import { DRIVE_JOB_COLUMNS, selectDrivesWithJob } from "./drives"
import { personName, selectInShop, updateInShop } from "./shop-scope"
import { cursorTimeSql, keysetPage } from "./paging"

export const REVIEW_PAGE_SIZE = 50

/**
 * Finished drives that need a second look and have had none: a verdict other than met, or any harsh event.
 * Oldest first; the cursor is the last row's `finishedAt|id` (see parseDriveCursor).
 */
export async function listReviewQueue(db: Db, shopId: string, cursor?: TimeCursor) {
  let q = selectDrivesWithJob(db, shopId)
    .innerJoin("score", "score.drive_id", "drive.id")
    .select([
      ...DRIVE_JOB_COLUMNS,
      "drive.id",
      "drive.public_id",
      "drive.job_id",
      "drive.task_id",
      "drive.vehicle_description",
      "drive.verdict",
      "drive.finished_at",
      "drive.created_at",
      "score.result",
      cursorTimeSql("drive.finished_at").as("cursor_time"),
    ])
    .where("drive.status", "=", "finished")
    .where("drive.review_status", "is", null)
    // needs_review (a verdict other than met, or any harsh event) and scored_at are kept on the drive when
    // it is scored; these conditions are those of the partial index drive_review_queue_idx.
    .where("drive.needs_review", "=", true)
    .where("drive.scored_at", "is not", null)
    .orderBy("drive.finished_at", "asc")
    .orderBy("drive.id", "asc")
    .limit(REVIEW_PAGE_SIZE + 1)
  if (cursor)
    q = q.where(sql<boolean>`(drive.finished_at, drive.id) > (${cursor.time}::timestamptz, ${cursor.id}::uuid)`)
  return keysetPage(await q.execute(), REVIEW_PAGE_SIZE, (last) =>
    last.cursor_time ? `${last.cursor_time}|${last.id}` : null,
  )
}

// ---- deciding a review ----

export type ReviewDecisionInput = {
  driveId: string
  shopId: string
  decision: "approve" | "redo"
  note: string
  reviewerId: string
}

/**
 * Stores the decision and closes the drive's review, only when nobody reviewed it first (the guard
 * `review_status is null` makes two leads deciding at once safe). Returns undefined when it lost that race.
 * Call inside a transaction.
 */
export async function insertReviewDecision(trx: Db, input: ReviewDecisionInput) {
  const drive = await updateInShop(trx, "drive", input.shopId)
    .set({ review_status: input.decision === "approve" ? "approved" : "redo" })
    .where("id", "=", input.driveId)
    .where("status", "=", "finished")
    .where("review_status", "is", null)
    .returningAll()
    .executeTakeFirst()
  if (!drive) return undefined
  const review = await trx
    .insertInto("review")
    .values({
      shop_id: input.shopId,
      drive_id: input.driveId,
      decision: input.decision,
      note: input.note,
      reviewer_id: input.reviewerId,
    })
    .returningAll()
    .executeTakeFirstOrThrow()
  return { drive, review }
}

/** The latest review of a drive with the reviewer's name. */
export async function findLatestReview(db: Db, driveId: string, shopId: string) {
  return selectInShop(db, "review", shopId)
    .select(["review.decision", "review.note", "review.created_at"])
    .select((eb) => personName(db, eb.ref("review.reviewer_id"), shopId).as("reviewer_name"))
    .where("review.drive_id", "=", driveId)
    .orderBy("review.created_at", "desc")
    .executeTakeFirst()
}

/** Name and e-mail of a person in the shop (the technician a redo goes back to). */
export async function findShopPerson(db: Db, userId: string, shopId: string) {
  return selectInShop(db, "app_user", shopId)
    .select(["id", "name", "email", "disabled"])
    .where("id", "=", userId)
    .executeTakeFirst()
}

// ---- what the drive record and the detail page read ----

/** The drive with its shop, job, vehicle, task, profile and people, all inside the shop. */
export async function findDriveRecordHead(db: Db, driveId: string, shopId: string) {
  return selectDrivesWithJob(db, shopId)
    .innerJoin("shop", "shop.id", "drive.shop_id")
    .leftJoin("condition_profile_version as pv", (j) =>
      j.onRef("pv.id", "=", "drive.profile_version_id").on("pv.shop_id", "=", shopId),
    )
    .leftJoin("condition_profile as p", (j) => j.onRef("p.id", "=", "pv.profile_id").on("p.shop_id", "=", shopId))
    .selectAll("drive")
    .select([
      ...DRIVE_JOB_COLUMNS,
      "shop.name as shop_name",
      "shop.settings as shop_settings",
      "job.customer_name",
      "job.customer_email",
      "job.status as job_status",
      "vehicle.vin",
      "vehicle.plate as vehicle_plate",
      "task.sensor as task_sensor",
      "task.method as task_method",
      "task.reason as task_reason",
      "p.name as profile_name",
      "pv.version as profile_version",
      "co.name as co_driver_name",
    ])
    .where("drive.id", "=", driveId)
    .executeTakeFirst()
}

/** Marks with the name of whoever logged each one, by time then arrival. */
export async function listMarksWithLoggers(db: Db, driveId: string, shopId: string) {
  return selectInShop(db, "mark", shopId)
    .select(["mark.id", "mark.t", "mark.kind", "mark.gap_ft", "mark.text"])
    .select((eb) => personName(db, eb.ref("mark.created_by"), shopId).as("by_name"))
    .where("mark.drive_id", "=", driveId)
    .orderBy("mark.t")
    .orderBy("mark.created_at")
    .execute()
}

/** Finished photos of the job that belong to the drive's task (or to the job as a whole). */
export async function listRecordPhotos(db: Db, jobId: string, taskId: string | null, shopId: string) {
  let q = selectInShop(db, "attachment", shopId)
    .select(["id", "filename", "content_type", "object_key", "thumbnail_key", "size", "task_id"])
    .where("job_id", "=", jobId)
    .where("status", "=", "complete")
    // the record embeds the JPEG thumbnails made at upload, so every photo type that gets one can go in
    .where("content_type", "in", ["image/jpeg", "image/png", "image/webp"])
  q = taskId ? q.where((eb) => eb.or([eb("task_id", "=", taskId), eb("task_id", "is", null)])) : q
  return q.orderBy("created_at").limit(12).execute()
}

/**
 * The shop a drive belongs to, for a share link only: the link's signature (made with the app secret)
 * is what grants access, so this is the one lookup by drive id alone (the internal id, unique across the
 * server, which share tokens name). Every read after it filters by shop.
 */
export async function findSharedDriveShop(db: Db, driveId: string) {
  return db
    .selectFrom("drive")
    .select(["id", "shop_id", "status", "share_epoch"])
    .where("id", "=", driveId)
    .executeTakeFirst()
}

/**
 * The drive a share link was made for, by the SHA-256 of its token: for links made before drive ids were
 * per shop (migration 2026_12_03_0100_drive_public_id), whose token names the drive's public id.
 */
export async function findSharedDriveByToken(db: Db, tokenSha256: string) {
  return db
    .selectFrom("share_link")
    .innerJoin("drive", (j) =>
      j.onRef("drive.id", "=", "share_link.drive_id").onRef("drive.shop_id", "=", "share_link.shop_id"),
    )
    .select(["drive.id", "drive.shop_id", "drive.status", "drive.share_epoch"])
    .where("share_link.token_sha256", "=", tokenSha256)
    .executeTakeFirst()
}

/** Withdraws every share link of the drive made so far; returns the new epoch, or undefined when not in the shop. */
export async function withdrawShareLinks(db: Db, driveId: string, shopId: string) {
  const row = await updateInShop(db, "drive", shopId)
    .set((eb) => ({ share_epoch: eb("share_epoch", "+", 1) }))
    .where("id", "=", driveId)
    .returning("share_epoch")
    .executeTakeFirst()
  return row?.share_epoch
}
