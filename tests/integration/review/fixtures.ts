// Drives for the review tests, written straight into the database with Kysely so these tests do not
// depend on the recording API: generated track -> scoreDrive -> drive, sample, mark and score rows.
import { randomUUID } from "node:crypto"
import type { DrivePattern } from "@/lib/tracks"
import { generateDrive, PATTERN_MIN_MINUTES } from "@/lib/tracks"
import { insertSamples } from "@/db/queries/samples"
import { storedSample } from "@/lib/drive-file/stored"
import { scoreDrive } from "@/lib/scoring"
import { withCheckDigit } from "@/lib/vin"
import { checklistBody } from "../../helpers/checklist"
import { insertDrive, testDb, type TestShop } from "../../helpers/db"

let vinCounter = 0
/** A VIN with a valid 49 CFR 565 check digit, different on every call. */
export function freshVin() {
  vinCounter += 1
  const serial = String((Date.now() % 1_000_000) * 10 + (vinCounter % 10))
    .padStart(6, "0")
    .slice(-6)
  return withCheckDigit(`0ZT4R8AB0RW${serial}`)
}

export async function insertJob(shop: TestShop, opts: { vin?: string; tasks?: number } = {}) {
  const db = testDb()
  const vin = opts.vin ?? freshVin()
  const vehicle = await db
    .insertInto("vehicle")
    .values({ shop_id: shop.shopId, vin, year: 2024, make: "Corvane", model: "Tessel", plate: null })
    .returning("id")
    .executeTakeFirstOrThrow()
  const job = await db
    .insertInto("job")
    .values({
      shop_id: shop.shopId,
      ro_number: `RO-${randomUUID().slice(0, 8)}`,
      customer_name: "Ines Marrow",
      customer_email: "ines@customer.invalid",
      vehicle_id: vehicle.id,
      status: "review",
      created_by: shop.lead.id,
    })
    .returning(["id", "ro_number"])
    .executeTakeFirstOrThrow()
  const tasks = await db
    .insertInto("job_task")
    .values(
      Array.from({ length: opts.tasks ?? 1 }, () => ({
        shop_id: shop.shopId,
        job_id: job.id,
        sensor: "forward_radar",
        method: "dynamic",
        reason: "bumper_or_grille_work",
        profile_id: null,
      })),
    )
    .returning("id")
    .execute()
  await db
    .insertInto("checklist")
    .values({
      task_id: tasks[0]!.id,
      shop_id: shop.shopId,
      data: JSON.stringify(checklistBody({ tires: { unit: "psi", placard: 35, fl: 35, fr: 35, rl: 34, rr: 35 } })),
      completed_by: shop.tech.id,
    })
    .execute()
  return { jobId: job.id, roNumber: job.ro_number, taskId: tasks[0]!.id, taskIds: tasks.map((t) => t.id), vin }
}

export type InsertDriveOptions = {
  pattern: DrivePattern
  seed?: number
  minutes?: number
  finishedAt?: Date
  job?: { jobId: string; taskId: string }
  driverId?: string
  coDriverId?: string | null
  status?: "recording" | "finished"
  reviewStatus?: "approved" | "redo" | null
}

export async function insertScoredDrive(shop: TestShop, opts: InsertDriveOptions) {
  const db = testDb()
  const minutes = opts.minutes ?? Math.max(PATTERN_MIN_MINUTES[opts.pattern], 6)
  const generated = generateDrive({
    seed: opts.seed ?? Math.floor(Math.random() * 1e6),
    pattern: opts.pattern,
    minutes,
  })
  const file = { ...generated, samples: generated.samples.map(storedSample) } // scored as stored
  const score = scoreDrive(file)
  const status = opts.status ?? "finished"
  const driverId = opts.driverId ?? shop.tech.id
  const { id: publicId, internalId: id } = await insertDrive(shop, {
    job_id: opts.job?.jobId ?? null,
    task_id: opts.job?.taskId ?? null,
    vehicle_description: opts.job ? null : "Loaner, unplanned drive",
    profile: JSON.stringify(score.profile),
    driver_id: driverId,
    co_driver_id: opts.coDriverId === undefined ? shop.codriver.id : opts.coDriverId,
    status,
    verdict: status === "finished" ? score.verdict : null,
    review_status: opts.reviewStatus ?? null,
    finished_at: status === "finished" ? (opts.finishedAt ?? new Date()) : null,
  })
  await insertSamples(db, id, shop.shopId, file.samples)
  await db
    .insertInto("mark")
    .values(
      file.marks.map((m, i) => ({
        id: randomUUID(),
        drive_id: id,
        shop_id: shop.shopId,
        t: m.t,
        kind: m.kind,
        gap_ft: m.gapFt ?? null,
        text: m.text ?? null,
        created_by: i % 2 === 0 ? driverId : (opts.coDriverId ?? shop.codriver.id),
      })),
    )
    .execute()
  if (status === "finished") {
    await db
      .insertInto("score")
      .values({ drive_id: id, shop_id: shop.shopId, verdict: score.verdict, result: JSON.stringify(score) })
      .execute()
  }
  // `id` is the id the API and pages know; `internalId` keys the drive's rows in the database.
  return { id: publicId, internalId: id, score }
}

/** Every message the local mail fake caught, as an admin sees them through the API. */
export async function capturedMail(admin: { get: (p: string) => Promise<{ status: number; body: any }> }) {
  const res = await admin.get("/api/dev/mail")
  if (res.status !== 200) throw new Error(`GET /api/dev/mail answered ${res.status}`)
  return res.body.messages as Array<{
    to: string[]
    subject: string
    attachments: Array<{ filename: string; contentType: string; size: number }>
  }>
}

export async function waitForMail(
  admin: { get: (p: string) => Promise<{ status: number; body: any }> },
  to: string,
  timeoutMs = 8000,
) {
  const until = Date.now() + timeoutMs
  for (;;) {
    const found = (await capturedMail(admin)).find((m) => m.to.includes(to))
    if (found || Date.now() > until) return found
    await new Promise((r) => setTimeout(r, 200))
  }
}
