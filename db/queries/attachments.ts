import type { Db } from "../client"
import { selectInShop, updateInShop } from "./shop-scope"

export function insertPendingAttachment(
  db: Db,
  a: {
    id: string
    shopId: string
    jobId: string
    taskId: string | null
    filename: string
    contentType: string
    size: number
    objectKey: string
    userId: string
  },
) {
  return db
    .insertInto("attachment")
    .values({
      id: a.id,
      shop_id: a.shopId,
      job_id: a.jobId,
      task_id: a.taskId,
      filename: a.filename,
      content_type: a.contentType,
      size: a.size,
      object_key: a.objectKey,
      uploaded_by: a.userId,
    })
    .returningAll()
    .executeTakeFirstOrThrow()
}

export function findAttachmentInShop(db: Db, id: string, shopId: string) {
  return selectInShop(db, "attachment", shopId).selectAll().where("id", "=", id).executeTakeFirst()
}

export function markAttachmentComplete(
  db: Db,
  id: string,
  shopId: string,
  size: number,
  thumbnailKey: string | null = null,
  objectKey?: string,
) {
  return updateInShop(db, "attachment", shopId)
    .set({
      status: "complete",
      size,
      thumbnail_key: thumbnailKey,
      completed_at: new Date(),
      ...(objectKey ? { object_key: objectKey } : {}),
    })
    .where("id", "=", id)
    .returningAll()
    .executeTakeFirstOrThrow()
}

export function deleteAttachment(db: Db, id: string, shopId: string) {
  return db.deleteFrom("attachment").where("id", "=", id).where("shop_id", "=", shopId).execute()
}

export function listCompleteAttachmentsForJob(db: Db, jobId: string, shopId: string) {
  return selectInShop(db, "attachment", shopId)
    .selectAll()
    .where("job_id", "=", jobId)
    .where("status", "=", "complete")
    .orderBy("created_at")
    .execute()
}
