import type { DriveKind, RoadTestCheck } from "@/lib/drive-file/road-test"
import { sql } from "kysely"
import type { Db } from "../client"
import { driveKey } from "./samples"
import { harshEventCountSql } from "./scores"
import type { Drive, DriveStatus, JobStatus, Verdict } from "../types"
import type { TimeCursor } from "@/lib/validation/drive"
import { cursorTimeSql, keysetPage } from "./paging"

const DRIVE_PAGE_SIZE = 50

export async function findDriveInShop(db: Db, driveId: string, shopId: string): Promise<Drive | undefined> {
  return db.selectFrom("drive").selectAll().where("id", "=", driveId).where("shop_id", "=", shopId).executeTakeFirst()
}

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
  let q = db
    .selectFrom("drive")
    .leftJoin("job", (j) => j.onRef("job.id", "=", "drive.job_id").on("job.shop_id", "=", shopId))
    .leftJoin("app_user as driver", (j) =>
      j.onRef("driver.id", "=", "drive.driver_id").on("driver.shop_id", "=", shopId),
    )
    .leftJoin("app_user as co", (j) => j.onRef("co.id", "=", "drive.co_driver_id").on("co.shop_id", "=", shopId))
    .leftJoin("job_task as task", (j) => j.onRef("task.id", "=", "drive.task_id").on("task.shop_id", "=", shopId))
    .leftJoin("vehicle", (j) => j.onRef("vehicle.id", "=", "job.vehicle_id").on("vehicle.shop_id", "=", shopId))
    .selectAll("drive")
    .select([
      "job.ro_number",
      "vehicle.year as vehicle_year",
      "vehicle.make as vehicle_make",
      "vehicle.model as vehicle_model",
      "driver.name as driver_name",
      "co.name as co_driver_name",
      "task.sensor as task_sensor",
      cursorTimeSql("drive.created_at").as("cursor_time"),
    ])
    .where("drive.shop_id", "=", shopId)
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
    db
      .selectFrom("mark")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("drive_id", "=", driveId)
      .where("shop_id", "=", shopId)
      .executeTakeFirstOrThrow(),
  ])
  return { samples: Number(samples.n), marks: Number(marks.n) }
}

export async function markDriveFinished(db: Db, driveId: string, shopId: string, verdict: Verdict): Promise<Drive> {
  return db
    .updateTable("drive")
    .set({ status: "finished", verdict, finished_at: sql<Date>`coalesce(finished_at, now())` })
    .where("id", "=", driveId)
    .where("shop_id", "=", shopId)
    .returningAll()
    .executeTakeFirstOrThrow()
}

export async function setDriveVerdict(db: Db, driveId: string, shopId: string, verdict: Verdict) {
  await db.updateTable("drive").set({ verdict }).where("id", "=", driveId).where("shop_id", "=", shopId).execute()
}

// ---- what a drive needs from jobs, tasks, profiles and people (all filtered by shop) ----

export async function findTaskForDrive(db: Db, taskId: string, shopId: string) {
  return db
    .selectFrom("job_task")
    .select(["id", "job_id", "sensor", "method", "profile_id"])
    .where("id", "=", taskId)
    .where("shop_id", "=", shopId)
    .executeTakeFirst()
}

export async function setJobStatus(db: Db, jobId: string, shopId: string, status: JobStatus) {
  await db
    .updateTable("job")
    .set({ status, updated_at: sql<Date>`now()` })
    .where("id", "=", jobId)
    .where("shop_id", "=", shopId)
    .execute()
}

/** Each task of the job with its latest drive (by start) and that drive's harsh-event count. */
export async function findJobTaskDrives(db: Db, jobId: string, shopId: string) {
  const tasks = await db
    .selectFrom("job_task")
    .select(["id", "method"])
    .where("job_id", "=", jobId)
    .where("shop_id", "=", shopId)
    .execute()
  const drives = await db
    .selectFrom("drive")
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
    .where("drive.shop_id", "=", shopId)
    .orderBy("drive.created_at", "asc")
    .execute()
  return { tasks, drives }
}
