// Revisions of a finished drive's record (DEVELOPERS.md "Record revisions and verification"): sealing the
// current state as a new revision when it changed, and telling the shop's leads when a verdict changed after
// the finish. Callers hold the drive row FOR UPDATE, or FOR KEY SHARE plus the drive's record lock.
import "server-only"
import { after } from "next/server"
import type { Db } from "@/db/client"
import { loadDriveFile } from "@/db/queries/drive-file"
import { insertNotification } from "@/db/queries/notifications"
import { findDriveRecordHead, findLatestReview } from "@/db/queries/reviews"
import { findLatestRevision, insertRevision, listShopLeads } from "@/db/queries/revisions"
import type { RevisionCause, ScoreRevision } from "@/db/types"
import type { AnyDriveFile } from "@/lib/drive-file/schema"
import { env } from "@/lib/env"
import { describeVehicle, roLabel, VERDICT_WORD } from "@/lib/record"
import { canonicalDriveFile, recordDigest, verificationCode } from "@/lib/record/seal"
import type { Score } from "@/lib/scoring"
import { sendMailQuietly, type OutgoingMail } from "./mail"

export const CAUSE_TEXT: Record<RevisionCause, string> = {
  finish: "Drive finished",
  import: "Drive file imported",
  late_samples: "Positions arrived after the finish",
  late_marks: "Marks arrived after the finish",
  mark_removed: "A mark was taken back after the finish",
  refinish: "Finished again",
  review: "Reviewed by a shop lead",
  resealed: "Record brought up to date",
}

export interface SealResult {
  revision: ScoreRevision
  /** The revision before this one, when this call made a new one. */
  previous: ScoreRevision | null
  created: boolean
}

/**
 * Seals the record as it stands (drive file, stored score, review decision) as revision N+1, unless the latest
 * revision already holds exactly that (its digest, computed again, is the same): then nothing is written.
 */
export async function sealRevision(
  trx: Db,
  drive: { id: string; public_id: string; shop_id: string },
  opts: { cause: RevisionCause; score: Score; driveFile?: AnyDriveFile; by?: string | null },
): Promise<SealResult> {
  const [driveFile, review, latest] = await Promise.all([
    opts.driveFile ?? loadDriveFile(trx, drive.id, drive.shop_id),
    findLatestReview(trx, drive.id, drive.shop_id),
    findLatestRevision(trx, drive.id, drive.shop_id),
  ])
  const sealed = {
    driveId: drive.public_id, // the id the record prints (for drives from before public ids, the same id)
    driveFile,
    score: opts.score,
    review: review ? { decision: review.decision, note: review.note } : null,
  }
  const fileJson = canonicalDriveFile(driveFile) // the bulk of the record: written once for both digests
  if (latest && recordDigest({ ...sealed, revision: latest.revision }, fileJson) === latest.digest)
    return { revision: latest, previous: null, created: false }
  const revision = (latest?.revision ?? 0) + 1
  const digest = recordDigest({ ...sealed, revision }, fileJson)
  const made = await insertRevision(trx, {
    driveId: drive.id,
    shopId: drive.shop_id,
    revision,
    cause: opts.cause,
    score: opts.score,
    reviewDecision: review?.decision ?? null,
    digest,
    code: verificationCode(digest),
    createdBy: opts.by ?? null,
  })
  return { revision: made, previous: latest ?? null, created: true }
}

/** E-mail to send once the transaction that made a revision has committed. */
export type FollowUp = { mail: OutgoingMail[] }

/**
 * A verdict that changed after the finish: a notice in the app for every shop lead (inside the transaction)
 * and an e-mail to each (returned, to send after the commit).
 */
export async function noticeVerdictChange(
  trx: Db,
  drive: { id: string; public_id: string; shop_id: string },
  sealed: SealResult,
): Promise<FollowUp | undefined> {
  const before = sealed.previous?.verdict
  const now = sealed.revision.verdict
  if (!sealed.created || !before || before === now) return undefined
  const [head, leads] = await Promise.all([
    findDriveRecordHead(trx, drive.id, drive.shop_id),
    listShopLeads(trx, drive.shop_id),
  ])
  const what = `${head?.ro_number ? `${roLabel(head.ro_number)}, ` : ""}${describeVehicle(
    head?.vin ? { year: head.vehicle_year, make: head.vehicle_make, model: head.vehicle_model } : null,
    head?.vehicle_description,
  )}`
  const why = CAUSE_TEXT[sealed.revision.cause].toLowerCase()
  const message = `The verdict of ${what} changed after the finish, from ${VERDICT_WORD[before]} to ${VERDICT_WORD[now]} (${why}; revision ${sealed.revision.revision}). Records sent before show the old verdict.`
  const link = `/drives/${drive.public_id}`
  for (const lead of leads) await insertNotification(trx, { shopId: drive.shop_id, userId: lead.id, message, link })
  const url = `${env().APP_URL.replace(/\/$/, "")}${link}`
  return {
    mail: leads.map((lead) => ({
      to: lead.email,
      subject: `Verdict changed after the finish: ${what}`,
      text: [
        `Hello ${lead.name},`,
        "",
        `The verdict of the drive for ${what} changed from ${VERDICT_WORD[before]} to ${VERDICT_WORD[now]} after it was finished.`,
        `Why: ${CAUSE_TEXT[sealed.revision.cause]}. This is revision ${sealed.revision.revision} of the record.`,
        "",
        "Any drive record sent or shared before shows the old verdict. Look at the drive and send the customer the new record if needed:",
        url,
      ].join("\n"),
    })),
  }
}

/** Sends the follow-up e-mail after the response has gone (failures are logged, never thrown). */
export function sendFollowUp(followUp: FollowUp | undefined) {
  if (!followUp?.mail.length) return
  const send = async () => {
    for (const mail of followUp.mail) await sendMailQuietly(mail)
  }
  try {
    after(send)
  } catch {
    // after() needs Next's request scope; a sample batch answered by the app's own server (early-routes.ts) has
    // none, and there the mail goes once the answer is on its way.
    setImmediate(() => void send())
  }
}
