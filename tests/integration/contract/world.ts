// A small shop world for the contract suites, made through the real API (jobs, drives, samples, marks,
// finish, import, uploads, profiles), plus helpers to check the error shape and that nothing changed.
import { randomUUID } from "node:crypto"
import { expect } from "vitest"
import type { Sample } from "@/lib/drive-file"
import { generateDrive } from "@/lib/tracks"
import { checklistBody } from "../../helpers/checklist"
import { createTestShop, testDb, type TestShop, type TestUser } from "../../helpers/db"
import { ApiClient, signedIn, type ApiResponse } from "../../helpers/http"
import { addPerson } from "../drives/helpers"
import { PDFDocument } from "pdf-lib"
import { createJob } from "../../helpers/jobs"
import { putToPresignedUrl } from "../jobs/helpers"

export type RoleName = "technician" | "co_driver" | "shop_lead" | "admin"
export const ROLE_NAMES: readonly RoleName[] = ["technician", "co_driver", "shop_lead", "admin"]

export type Clients = Record<RoleName, ApiClient> & { anon: ApiClient }

export async function clientsFor(shop: TestShop): Promise<Clients> {
  const [technician, co_driver, shop_lead, admin] = await Promise.all([
    signedIn(shop.tech),
    signedIn(shop.codriver),
    signedIn(shop.lead),
    signedIn(shop.admin),
  ])
  return { technician, co_driver, shop_lead, admin, anon: new ApiClient() }
}

export function userOf(shop: TestShop, role: RoleName): TestUser {
  return { technician: shop.tech, co_driver: shop.codriver, shop_lead: shop.lead, admin: shop.admin }[role]
}

/** Samples of an invented drive (lib/tracks); `startMs` keeps batches of one drive apart in time. */
export function samplesOf(count: number, seed = 11, startMs = Date.UTC(2026, 0, 1, 10)): Sample[] {
  const minutes = Math.max(1, Math.ceil(count / 60) + 1)
  return generateDrive({ seed, startMs, minutes, pattern: "never-cleared" }).samples.slice(0, count)
}

/** A drive file that scores "short" (lib/tracks): finished drives for record, review and share. */
export function driveFile(seed = 5) {
  return generateDrive({ seed, minutes: 8, pattern: "short" })
}

export async function startDrive(client: ApiClient, body: Record<string, unknown> = {}): Promise<string> {
  const id = randomUUID()
  const res = await client.post("/api/drives", { id, vehicleDescription: "2021 Invented Pellam, grey", ...body })
  if (res.status !== 201) throw new Error(`start failed: ${res.status} ${res.text}`)
  return id
}

/** A finished, scored drive through POST /api/drives/import. */
export async function importDrive(client: ApiClient, seed = 5, query = ""): Promise<string> {
  const res = await client.post(`/api/drives/import${query}`, driveFile(seed))
  if (res.status !== 201) throw new Error(`import failed: ${res.status} ${res.text}`)
  return res.body.drive.id
}

/** A drive recorded through the API: start (naming the co-driver), samples, marks, finish. */
export async function recordedDrive(
  driver: ApiClient,
  coDriverId: string | null,
  opts: { finish?: boolean; body?: Record<string, unknown> } = {},
) {
  const id = await startDrive(driver, { coDriverId, ...opts.body })
  const file = driveFile(9)
  const s = await driver.post(`/api/drives/${id}/samples`, { batchId: `b-${randomUUID()}`, samples: file.samples })
  if (s.status !== 200) throw new Error(`samples failed: ${s.status} ${s.text}`)
  const markIds = file.marks.map(() => randomUUID())
  const m = await driver.post(`/api/drives/${id}/marks`, {
    marks: file.marks.map((mk, i) => ({ ...mk, id: markIds[i] })),
  })
  if (m.status !== 200) throw new Error(`marks failed: ${m.status} ${m.text}`)
  if (opts.finish) {
    const f = await driver.post(`/api/drives/${id}/finish`)
    if (f.status !== 200) throw new Error(`finish failed: ${f.status} ${f.text}`)
  }
  return { id, markIds }
}

export type World = {
  shop: TestShop
  c: Clients
  /** A second technician and a co-driver the drives below do not name. */
  otherTech: ApiClient
  otherTechUser: { id: string }
  unnamedCo: ApiClient
  job: { id: string; taskId: string }
  /** A job with no drive naming the co-driver. */
  bareJob: { id: string; taskId: string }
  /** Driven by the technician, naming the co-driver, on `job`; still recording. */
  recording: { id: string; markIds: string[] }
  /** Driven by the technician, naming the co-driver; finished and scored, not reviewed. */
  finished: { id: string; markIds: string[] }
  /** Driven by the other technician, no co-driver; finished. */
  foreign: { id: string; markIds: string[] }
  attachmentId: string
  profileId: string
}

export async function buildWorld(label: string): Promise<World> {
  const shop = await createTestShop(label)
  const c = await clientsFor(shop)
  const [t2, co2] = await Promise.all([
    addPerson(shop.shopId, "technician", shop.tech),
    addPerson(shop.shopId, "co_driver", shop.tech),
  ])
  const [otherTech, unnamedCo] = await Promise.all([signedIn(t2), signedIn(co2)])
  const [jobRow, bareRow] = await Promise.all([createJob(c.shop_lead), createJob(c.shop_lead)])
  const job = { id: jobRow.id as string, taskId: jobRow.tasks[0].id as string }
  const bareJob = { id: bareRow.id as string, taskId: bareRow.tasks[0].id as string }
  const checklist = await c.technician.request(
    "PUT",
    `/api/jobs/${job.id}/tasks/${job.taskId}/checklist`,
    checklistBody(),
  )
  if (checklist.status !== 200) throw new Error(`checklist failed: ${checklist.status} ${checklist.text}`)
  const [recording, finished, foreign] = await Promise.all([
    recordedDrive(c.technician, shop.codriver.id, { body: { jobId: job.id, taskId: job.taskId } }),
    recordedDrive(c.technician, shop.codriver.id, { finish: true }),
    recordedDrive(otherTech, null, { finish: true }),
  ])
  const pdf = await onePagePdf()
  const up = await c.technician.post("/api/uploads", {
    jobId: job.id,
    filename: "alignment.pdf",
    contentType: "application/pdf",
    size: pdf.length,
  })
  if (up.status !== 201) throw new Error(`upload failed: ${up.status} ${up.text}`)
  await putToPresignedUrl(up.body.uploadUrl, "application/pdf", pdf)
  const done = await c.technician.post(`/api/uploads/${up.body.attachmentId}/complete`)
  if (done.status !== 200) throw new Error(`upload complete failed: ${done.status} ${done.text}`)
  const profile = await c.shop_lead.post("/api/profiles", {
    name: `Contract profile ${randomUUID().slice(0, 6)}`,
    sensor: "forward_radar",
  })
  if (profile.status !== 201) throw new Error(`profile failed: ${profile.status} ${profile.text}`)
  return {
    shop,
    c,
    otherTech,
    otherTechUser: t2,
    unnamedCo,
    job,
    bareJob,
    recording,
    finished,
    foreign,
    attachmentId: up.body.attachmentId,
    profileId: profile.body.profile?.id ?? profile.body.id,
  }
}

// The e2e suites take the checklist from here.
export { checklistBody }

/** A real one-page PDF (pdf-lib): attachments whose bytes match their declared type. */
export async function onePagePdf(): Promise<Uint8Array> {
  const doc = await PDFDocument.create()
  doc.addPage([200, 200])
  return doc.save()
}

/** The API's error shape (api.md "Errors"): `{error:{code,message,fields?}}` with nothing else beside it. */
export function expectErrorShape(res: ApiResponse, status?: number) {
  if (status !== undefined) expect(res.status, `${res.status} ${res.text.slice(0, 300)}`).toBe(status)
  expect(res.status, res.text.slice(0, 300)).toBeGreaterThanOrEqual(400)
  expect(res.headers.get("content-type") ?? "").toContain("application/json")
  expect(Object.keys(res.body)).toEqual(["error"])
  const { error } = res.body
  expect(typeof error.code).toBe("string")
  expect(typeof error.message).toBe("string")
  expect(error.message.length).toBeGreaterThan(0)
  const extra = Object.keys(error).filter((k) => !["code", "message", "fields"].includes(k))
  expect(extra).toEqual([])
  if ("fields" in error) {
    expect(typeof error.fields).toBe("object")
    for (const v of Object.values(error.fields)) expect(typeof v).toBe("string")
  }
  // In the API's own words ("is required", "must be text"), never a validation library's stock sentence.
  for (const text of [error.message, ...Object.values(error.fields ?? {})])
    expect(text, res.text.slice(0, 300)).not.toMatch(/Invalid input|expected \w+, received/)
}

const SHOP_TABLES = [
  "drive",
  "sample_decoded",
  "sample_batch",
  "mark",
  "score",
  "review",
  "job",
  "job_task",
  "checklist",
  "attachment",
  "vehicle",
  "condition_profile",
  "condition_profile_version",
  "notification",
  "setup_record",
] as const

/** Every row a shop owns (sessions aside), as text: equal before and after = nothing of the shop changed. */
export async function snapshotShop(shopId: string): Promise<Record<string, string>> {
  const db = testDb()
  const out: Record<string, string> = {}
  await Promise.all(
    SHOP_TABLES.map(async (table) => {
      const rows = await db
        .selectFrom(table as "drive")
        .selectAll()
        .where("shop_id", "=", shopId)
        .execute()
      out[table] = JSON.stringify(rows.map((r) => JSON.stringify(r)).sort())
    }),
  )
  const users = await db
    .selectFrom("app_user")
    .select(["id", "email", "name", "role", "disabled"])
    .where("shop_id", "=", shopId)
    .orderBy("id")
    .execute()
  out.app_user = JSON.stringify(users)
  const shop = await db
    .selectFrom("shop")
    .select(["name", "settings"])
    .where("id", "=", shopId)
    .executeTakeFirstOrThrow()
  out.shop = JSON.stringify(shop)
  return out
}

/** Row counts of a shop's tables: a refused write leaves them as they were. */
export async function countShopRows(shopId: string): Promise<Record<string, number>> {
  const db = testDb()
  const out: Record<string, number> = {}
  await Promise.all(
    [...SHOP_TABLES, "app_user" as const].map(async (table) => {
      const row = await db
        .selectFrom(table as "drive")
        .select((eb) => eb.fn.countAll<string>().as("n"))
        .where("shop_id", "=", shopId)
        .executeTakeFirstOrThrow()
      out[table] = Number(row.n)
    }),
  )
  return out
}
