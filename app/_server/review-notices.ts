import "server-only"
import type { Db } from "@/db/client"
import { insertNotification } from "@/db/queries/notifications"
import { listReviewListeners } from "@/db/queries/review-notices"
import { findDriveRecordHead } from "@/db/queries/reviews"
import type { Drive } from "@/db/types"
import type { Score } from "@/lib/scoring"
import { env } from "@/lib/env"
import { describeVehicle, roLabel, VERDICT_WORD } from "@/lib/record"
import { sendMailQuietly } from "./mail"

type Outgoing = { to: string; subject: string; text: string }

/** The review queue's rule (db/queries/reviews.ts listReviewQueue): a verdict other than met, or any harsh event. */
function needsReview(score: Pick<Score, "verdict" | "harshEvents">): boolean {
  return score.verdict !== "met" || (score.harshEvents?.accel ?? 0) + (score.harshEvents?.decel ?? 0) > 0
}

/**
 * A drive has just finished: when it needs review, each of the shop's leads gets a notice (the driver excepted,
 * when a lead drove). Call inside the finishing transaction; send the returned e-mails (for the leads who asked
 * for them) once it has committed.
 */
export async function noticeDriveWaiting(trx: Db, drive: Drive, score: Score): Promise<Outgoing[]> {
  if (!needsReview(score)) return []
  const [leads, head] = await Promise.all([
    listReviewListeners(trx, drive.shop_id),
    findDriveRecordHead(trx, drive.id, drive.shop_id),
  ])
  const vehicle = describeVehicle(
    head?.vin ? { year: head.vehicle_year, make: head.vehicle_make, model: head.vehicle_model } : null,
    drive.vehicle_description,
  )
  const what = `${head?.ro_number ? `${roLabel(head.ro_number)}, ` : ""}${vehicle}`
  const verdict = drive.verdict ? (VERDICT_WORD[drive.verdict] ?? drive.verdict) : "not scored"
  const message = `A drive waits for your review (${what}): ${verdict}, driven by ${head?.driver_name ?? "someone"}.`
  const link = `/drives/${drive.public_id}`
  const mails: Outgoing[] = []
  for (const lead of leads) {
    if (lead.id === drive.driver_id) continue
    await insertNotification(trx, { shopId: drive.shop_id, userId: lead.id, message, link })
    if (lead.review_mail)
      mails.push({
        to: lead.email,
        subject: `Drive waiting for review: ${what}`,
        text: [
          `Hello ${lead.name},`,
          "",
          message,
          "",
          "Review it here:",
          `${env().APP_URL.replace(/\/$/, "")}${link}`,
          "",
          "You get this e-mail because you asked for it on your settings page.",
        ].join("\n"),
      })
  }
  return mails
}

export async function sendReviewMails(mails: Outgoing[]) {
  for (const mail of mails) await sendMailQuietly(mail)
}
