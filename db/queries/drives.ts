import type { DriveKind, RoadTestCheck } from "@/lib/drive-file/road-test"
import { sql } from "kysely"
import type { Db } from "../client"
import { driveKey } from "./samples"
import { harshEventCountSql } from "./scores"
import { selectInShop, updateInShop } from "./shop-scope"
import type { Drive, DriveStatus, JobStatus, Verdict } from "../types"
import type { TimeCursor } from "@/lib/validation/drive"
import { cursorTimeSql, keysetPage } from "./paging"

const DRIVE_PAGE_SIZE = 50

export async function findDriveInShop(db: Db, driveId: string, shopId: string): Promise<Drive | undefined> {
  return selectInShop(db, "drive", shopId).selectAll().where("id", "=", driveId).executeTakeFirst()
}

/**
 * The shop's drives with their job, the job's vehicle, the task, the driver and the co-driver, each joined inside the
 * shop by its key (so no join adds a row; a read that takes nothing from one leaves it to the planner to drop).
 */
export function selectDrivesWithJob(db: Db, shopId: string) {
  return selectInShop(db, "drive", shopId)
    .leftJoin("job", (j) => j.onRef("job.id", "=", "drive.job_id").on("job.shop_id", "=", shopId))
    .leftJoin("vehicle", (j) => j.onRef("vehicle.id", "=", "job.vehicle_id").on("vehicle.shop_id", "=", shopId))
    .leftJoin("job_task as task", (j) => j.onRef("task.id", "=", "drive.task_id").on("task.shop_id", "=", shopId))
    .leftJoin("app_user as driver", (j) =>
      j.onRef("driver.id", "=", "drive.driver_id").on("driver.shop_id", "=", shopId),
    )
    .leftJoin("app_user as co", (j) => j.onRef("co.id", "=", "drive.co_driver_id").on("co.shop_id", "=", shopId))
}

/** What a list of drives (or one drive's record) shows of its job, vehicle and driver: columns of selectDrivesWithJob. */
export const DRIVE_JOB_COLUMNS = [
  "job.ro_number",
  "vehicle.year as vehicle_year",
  "vehicle.make as vehicle_make",
  "vehicle.model as vehicle_model",
  "driver.name as driver_name",
] as const

export interface NewDriveValues {
  /** The internal id, internalDriveId(shopId, publicId) (lib/drive-id.ts; the table's CHECK holds it to that). */
  id: string
  publicId: string
  shopId: string
  jobId: string | null
  taskId: string | null
  vehicleDescription: string | null
  profileVersionId: string | null
  profile: Record<string, unknown>
  driverId: string
  coDriverId: string | null
  status?: DriveStatus
  source?: "recorder" | "import"
  /** learn (the default), road_test or learn_and_road_test, with the road-test checks frozen at the start. */
  kind?: DriveKind
  roadTest?: RoadTestCheck[] | null
}

/** Inserts the drive unless its id exists already; returns whether this call made it. */
export async function insertDrive(db: Db, v: NewDriveValues): Promise<boolean> {
  const rows = await db
    .insertInto("drive")
    .values({
      id: v.id,
      public_id: v.publicId,
      shop_id: v.shopId,
      job_id: v.jobId,
      task_id: v.taskId,
      vehicle_description: v.vehicleDescription,
      profile_version_id: v.profileVersionId,
      profile: JSON.stringify(v.profile),
      driver_id: v.driverId,
      co_driver_id: v.coDriverId,
      status: v.status ?? "recording",
      source: v.source ?? "recorder",
      kind: v.kind ?? "learn",
      road_test: v.roadTest ? JSON.stringify(v.roadTest) : null,
    })
    // Every unique key is an arbiter: the same drive races in on `id` and on (shop_id, public_id) alike.
    .onConflict((oc) => oc.doNothing())
    .returning("id")
    .execute()
  return rows.length === 1
}

export interface DriveListFilter {
  verdict?: Verdict
  status?: DriveStatus
  /** Co-drivers see only drives that name them. */
  coDriverId?: string
  cursor?: TimeCursor
}

/** Newest first; the cursor is the last row's `createdAt|id` (see parseDriveCursor). */
export async function listDrives(db: Db, shopId: string, filter: DriveListFilter) {
  let q = selectDrivesWithJob(db, shopId)
    .selectAll("drive")
    .select([
      ...DRIVE_JOB_COLUMNS,
      "co.name as co_driver_name",
      "task.sensor as task_sensor",
      cursorTimeSql("drive.created_at").as("cursor_time"),
    ])
    .orderBy("drive.created_at", "desc")
    .orderBy("drive.id", "desc")
    .limit(DRIVE_PAGE_SIZE + 1)
  if (filter.verdict) q = q.where("drive.verdict", "=", filter.verdict)
  if (filter.status) q = q.where("drive.status", "=", filter.status)
  if (filter.coDriverId) q = q.where("drive.co_driver_id", "=", filter.coDriverId)
  if (filter.cursor) {
    const { time, id } = filter.cursor
    q = q.where(sql<boolean>`(drive.created_at, drive.id) < (${time}::timestamptz, ${id}::uuid)`)
  }
  return keysetPage(await q.execute(), DRIVE_PAGE_SIZE, (last) => `${last.cursor_time}|${last.id}`)
}

export async function countDriveData(db: Db, driveId: string, shopId: string) {
  const [samples, marks] = await Promise.all([
    db
      .selectFrom("sample")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("drive_key", "=", driveKey(driveId, shopId))
      .executeTakeFirstOrThrow(),
    selectInShop(db, "mark", shopId)
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("drive_id", "=", driveId)
      .executeTakeFirstOrThrow(),
  ])
  return { samples: Number(samples.n), marks: Number(marks.n) }
}

export async function markDriveFinished(db: Db, driveId: string, shopId: string, verdict: Verdict): Promise<Drive> {
  return updateInShop(db, "drive", shopId)
    .set({ status: "finished", verdict, finished_at: sql<Date>`coalesce(finished_at, now())` })
    .where("id", "=", driveId)
    .returningAll()
    .executeTakeFirstOrThrow()
}

export async function setDriveVerdict(db: Db, driveId: string, shopId: string, verdict: Verdict) {
  await updateInShop(db, "drive", shopId).set({ verdict }).where("id", "=", driveId).execute()
}

// ---- what a drive needs from jobs, tasks, profiles and people (all filtered by shop) ----

export async function findTaskForDrive(db: Db, taskId: string, shopId: string) {
  return selectInShop(db, "job_task", shopId)
    .select(["id", "job_id", "sensor", "method", "profile_id"])
    .where("id", "=", taskId)
    .executeTakeFirst()
}

export async function setJobStatus(db: Db, jobId: string, shopId: string, status: JobStatus) {
  await updateInShop(db, "job", shopId)
    .set({ status, updated_at: sql<Date>`now()` })
    .where("id", "=", jobId)
    .execute()
}

/** Each task of the job with its latest drive (by start) and that drive's harsh-event count. */
export async function findJobTaskDrives(db: Db, jobId: string, shopId: string) {
  const tasks = await selectInShop(db, "job_task", shopId)
    .select(["id", "method"])
    .where("job_id", "=", jobId)
    .execute()
  const drives = await selectInShop(db, "drive", shopId)
    .leftJoin("score", (j) => j.onRef("score.drive_id", "=", "drive.id").on("score.shop_id", "=", shopId))
    .select([
      "drive.task_id",
      "drive.status",
      "drive.verdict",
      "drive.review_status",
      "drive.created_at",
      harshEventCountSql.as("harsh_events"),
    ])
    .where("drive.job_id", "=", jobId)
    .orderBy("drive.created_at", "asc")
    .execute()
  return { tasks, drives }
}
