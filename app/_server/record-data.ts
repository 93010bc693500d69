import "server-only"
import type { Db } from "@/db/client"
import { findChecklistForTask } from "@/db/queries/checklists"
import {
  findDriveRecordHead,
  findLatestReview,
  findSharedDriveByToken,
  findSharedDriveShop,
  listMarksWithLoggers,
  listRecordPhotos,
} from "@/db/queries/reviews"
import { env } from "@/lib/env"
import { sha256Hex } from "@/lib/record/seal"
import { DEFAULT_TIME_ZONE, isTimeZone } from "@/lib/format"
import { shareTokenDriveId, verifyShareToken } from "@/lib/share"
import { listSamples } from "@/db/queries/samples"
import { findScore } from "@/db/queries/scores"
import type { ShopSettings } from "@/db/types"
import { resolveProfile } from "@/lib/drive-file/profile"
import type { Mark } from "@/lib/drive-file/schema"
import { checklistRows, computeTimeline, type RecordData, type RecordPhoto } from "@/lib/record"
import { loadCalibrations } from "./record-calibrations"
import { recordPhotoBytes } from "./thumbnails"

export type RecordHead = NonNullable<Awaited<ReturnType<typeof findDriveRecordHead>>>

/**
 * Everything the drive record shows, read inside the shop. undefined when the drive is not in the shop;
 * `score: null` while the drive has no stored score (still being recorded).
 */
export async function loadRecordData(
  db: Db,
  driveId: string,
  shopId: string,
  opts: { photos?: boolean } = {},
): Promise<{ head: RecordHead; data: RecordData | null } | undefined> {
  const head = await findDriveRecordHead(db, driveId, shopId)
  if (!head) return undefined
  const score = await findScore(db, driveId, shopId)
  if (!score) return { head, data: null }
  const [samples, marks, review, checklist, photoRows] = await Promise.all([
    listSamples(db, driveId, shopId),
    listMarksWithLoggers(db, driveId, shopId),
    findLatestReview(db, driveId, shopId),
    head.task_id ? findChecklistForTask(db, head.task_id, shopId) : Promise.resolve(undefined),
    head.job_id && opts.photos !== false
      ? listRecordPhotos(db, head.job_id, head.task_id, shopId)
      : Promise.resolve([]),
  ])
  const profile = resolveProfile(head.profile)
  // Thumbnails rather than the full photos, so a record with a dozen phone photos stays a small PDF.
  const photos = (
    await Promise.all(
      photoRows.map(async (p): Promise<RecordPhoto | null> => {
        try {
          return { filename: p.filename, ...(await recordPhotoBytes(p)) }
        } catch (error) {
          console.error("[straightaway] photo %s for the drive record could not be read", p.id, error)
          return null
        }
      }),
    )
  ).filter((p): p is RecordPhoto => p !== null)
  const settings = (head.shop_settings ?? {}) as ShopSettings
  const markLoggers = [...new Set(marks.map((m) => m.by_name).filter((n): n is string => Boolean(n)))]
  const data: RecordData = {
    driveId: head.public_id,
    shopName: head.shop_name,
    job: head.ro_number ? { roNumber: head.ro_number, customerName: head.customer_name ?? "" } : null,
    vehicle: head.vin
      ? {
          vin: head.vin,
          year: head.vehicle_year,
          make: head.vehicle_make,
          model: head.vehicle_model,
          plate: head.vehicle_plate,
        }
      : null,
    vehicleDescription: head.vehicle_description,
    task: head.task_sensor
      ? { sensor: head.task_sensor, method: head.task_method ?? "", reason: head.task_reason ?? "" }
      : null,
    profileName: head.profile_name
      ? `${head.profile_name}${head.profile_version ? ` (version ${head.profile_version})` : ""}`
      : null,
    checklist: checklist
      ? {
          rows: checklistRows(checklist.data as Record<string, unknown>, settings.tirePressureTolerancePsi ?? 3),
          notes: String((checklist.data as { notes?: unknown }).notes ?? ""),
          completedBy: checklist.completed_by_name ?? null,
          completedAt: checklist.completed_at ? new Date(checklist.completed_at).toISOString() : null,
        }
      : null,
    photos,
    score,
    timeline: computeTimeline(
      samples,
      marks.map((m) => ({ t: m.t, kind: m.kind as Mark["kind"], gapFt: m.gap_ft, text: m.text ?? undefined })),
      profile,
    ),
    marks: marks.map((m) => ({ t: m.t, kind: m.kind, gapFt: m.gap_ft, text: m.text, byName: m.by_name })),
    driverName: head.driver_name,
    coDriverName: head.co_driver_name,
    markLoggers,
    review: review
      ? {
          decision: review.decision,
          note: review.note,
          reviewerName: review.reviewer_name,
          at: new Date(review.created_at).toISOString(),
        }
      : null,
    startedAt: score.startedAtMs ? new Date(score.startedAtMs).toISOString() : new Date(head.created_at).toISOString(),
    finishedAt: head.finished_at ? new Date(head.finished_at).toISOString() : null,
    generatedAt: new Date().toISOString(),
    calibrations: head.job_id ? await loadCalibrations(db, head.job_id, shopId, head.id) : [],
    units: settings.units === "metric" ? "metric" : "imperial",
    timeZone: settings.timeZone && isTimeZone(settings.timeZone) ? settings.timeZone : DEFAULT_TIME_ZONE,
  }
  return { head, data }
}

export function recordFilename(head: Pick<RecordHead, "public_id" | "ro_number">) {
  const ro = head.ro_number?.replace(/[^A-Za-z0-9_-]+/g, "-").slice(0, 40)
  return `drive-record-${ro || head.public_id.slice(0, 8)}.pdf`
}

/** The record PDF as the browser opens it, inline and never cached; `headers` adds to those. */
export function recordPdfResponse(
  pdf: Uint8Array,
  head: Pick<RecordHead, "public_id" | "ro_number">,
  headers: Record<string, string> = {},
) {
  return new Response(Buffer.from(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `inline; filename="${recordFilename(head)}"`,
      "cache-control": "private, no-store",
      ...headers,
    },
  })
}

export type SharedRecord =
  | { ok: true; data: RecordData; head: RecordHead; expiresAtMs: number }
  | { ok: false; reason: "malformed" | "bad_signature" | "expired" | "withdrawn" | "gone" | "not_ready" }

/**
 * A share link's record. Only the drive's share epoch is read before the signature and expiry are checked
 * (a token signed under an earlier epoch was withdrawn); nothing of the record is read for a bad token.
 */
export async function loadSharedRecord(db: Db, token: string, opts: { photos?: boolean } = {}): Promise<SharedRecord> {
  const namedId = shareTokenDriveId(token)
  // A token names the drive's internal id; one made before drive ids were per shop names its public id and is
  // found through its share_link row instead.
  const named = namedId
    ? ((await findSharedDriveShop(db, namedId)) ?? (await findSharedDriveByToken(db, sha256Hex(token))))
    : undefined
  const check = verifyShareToken(env().APP_SECRET, token, Date.now(), named?.share_epoch ?? 0)
  if (!check.ok) return { ok: false, reason: check.reason }
  const drive = named
  if (!drive) return { ok: false, reason: "gone" }
  const loaded = await loadRecordData(db, drive.id, drive.shop_id, opts)
  if (!loaded) return { ok: false, reason: "gone" }
  if (!loaded.data) return { ok: false, reason: "not_ready" }
  return { ok: true, data: loaded.data, head: loaded.head, expiresAtMs: check.expiresAtMs }
}
