// The public check of a drive record (DEVELOPERS.md "Record revisions and verification"): a verification code
// or a PDF's bytes -> which revision of which record it is, and whether a newer one exists. It answers with
// no more than the PDF itself prints (shop, vehicle, verdict, revision and when it was sealed).
import "server-only"
import { findShopSettings } from "@/db/queries/shop-settings"
import { formatDateTime } from "@/lib/format"
import type { Db } from "@/db/client"
import { findDriveRecordHead } from "@/db/queries/reviews"
import {
  countRecentVerifyAttempts,
  findRevisionByCode,
  findRevisionByPdfHash,
  insertVerifyAttempt,
} from "@/db/queries/revisions"
import { AppError } from "@/lib/errors"
import { describeVehicle, VERDICT_WORD } from "@/lib/record"
import { sha256Hex } from "@/lib/record/seal"
import { BodyTooLargeError, readBodyBytes as readStreamBytes } from "@/lib/validation/json-body"
import type { VerifyAnswer } from "@/lib/api/types"

const VERIFY_WINDOW_SECONDS = 15 * 60
/** Per client address in the window: lookups that matched nothing, and lookups in all (like sign-in's limits). */
const MAX_UNMATCHED_VERIFY = 20
const MAX_VERIFY = 100
/** An issued record with a dozen photo thumbnails is well under 2 MB. */
export const MAX_VERIFY_PDF_BYTES = 10 * 1024 * 1024

export type VerifyInput = { code: string } | { pdf: Uint8Array }

/** When the revision was sealed, exactly as the PDF prints it: in the shop's time zone, named. */
async function printedTime(db: Db, shopId: string, at: Date) {
  return formatDateTime(at, (await findShopSettings(db, shopId)).timeZone, { zoneName: true })
}

/**
 * `clientAddress` is null when no trusted proxy names the client (TRUST_PROXY unset): then no per-address limit
 * applies, as for sign-in, so no client can lock others out; a code is 60 random bits, too many to guess.
 */
export async function verifyRecord(db: Db, clientAddress: string | null, input: VerifyInput): Promise<VerifyAnswer> {
  const seen = clientAddress
    ? await countRecentVerifyAttempts(db, clientAddress, VERIFY_WINDOW_SECONDS)
    : { unmatched: 0, all: 0, oldest: null }
  if (seen.unmatched >= MAX_UNMATCHED_VERIFY || seen.all >= MAX_VERIFY) {
    const wait = seen.oldest
      ? Math.max(1, Math.ceil((new Date(seen.oldest).getTime() + VERIFY_WINDOW_SECONDS * 1000 - Date.now()) / 1000))
      : VERIFY_WINDOW_SECONDS
    throw new AppError(
      "too_many_attempts",
      `Too many checks from this address. Try again in ${Math.ceil(wait / 60)} min.`,
      undefined,
      { "Retry-After": String(wait) },
    )
  }
  const found =
    "code" in input ? await findRevisionByCode(db, input.code) : await findRevisionByPdfHash(db, sha256Hex(input.pdf))
  const head = found ? await findDriveRecordHead(db, found.drive_id, found.shop_id) : undefined
  if (clientAddress) await insertVerifyAttempt(db, clientAddress, Boolean(found && head))
  if (!found || !head) {
    return {
      result: "no_match",
      message:
        "code" in input
          ? "This code matches no record issued with Straightaway. Check the code on the PDF, or ask the shop for the record."
          : "This file matches no record issued with Straightaway. A PDF changed in any way, even by one byte, matches nothing; ask the shop for the record.",
    }
  }
  const latest = Number(found.latest_revision)
  const record = {
    shopName: head.shop_name,
    vehicle: describeVehicle(
      head.vin ? { year: head.vehicle_year, make: head.vehicle_make, model: head.vehicle_model } : null,
      head.vehicle_description,
    ),
    verdict: VERDICT_WORD[found.verdict],
    sealedAt: await printedTime(db, found.shop_id, found.created_at),
  }
  const what = "code" in input ? "This code" : "This file"
  return latest > found.revision
    ? {
        result: "newer_revision",
        message: `${what} matches revision ${found.revision} of a drive record issued with Straightaway, but the record has been revised since: revision ${latest} is the latest. Ask the shop for the current record.`,
        revision: found.revision,
        latestRevision: latest,
        record,
      }
    : {
        result: "matches",
        message: `${what} matches revision ${found.revision} of a drive record issued with Straightaway. It is the latest revision.`,
        revision: found.revision,
        latestRevision: latest,
        record,
      }
}

/** A request body read up to `maxBytes`, whatever Content-Length says (a chunked body is counted as it comes). */
export async function readBodyBytes(req: Request, maxBytes: number): Promise<Uint8Array> {
  try {
    return await readStreamBytes(req.body, maxBytes, Number(req.headers.get("content-length") ?? 0))
  } catch (error) {
    if (error instanceof BodyTooLargeError) {
      throw new AppError(
        "too_large",
        `The file is over ${Math.round(maxBytes / 1024 / 1024)} MB; an issued record is far smaller.`,
      )
    }
    throw error
  }
}
