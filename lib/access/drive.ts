// Who may do what with a drive, and what a finished drive does to its job. Pure: callers load the rows.
import type { Role } from "@/lib/auth/roles"
import type { JobStatus, ReviewStatus } from "@/lib/labels"
import type { Verdict } from "@/lib/scoring/types"

export interface DriveActor {
  id: string
  role: Role
  shopId: string
}

export interface DriveAccessFacts {
  shopId: string
  driverId: string
  coDriverId: string | null
  status: "recording" | "finished"
  reviewStatus: ReviewStatus | null
}

/** Any role of the drive's shop, except a co-driver, who sees only drives that name them. */
export function canSeeDrive(actor: DriveActor, drive: DriveAccessFacts): boolean {
  if (actor.shopId !== drive.shopId) return false
  if (actor.role === "co_driver") return drive.coDriverId === actor.id
  return true
}

/** Samples and marks: the drive's driver, its co-driver, a shop lead, an admin. */
export function canRecordOnDrive(actor: DriveActor, drive: DriveAccessFacts): boolean {
  if (!canSeeDrive(actor, drive)) return false
  if (actor.role === "admin" || actor.role === "shop_lead") return true
  return actor.id === drive.driverId || actor.id === drive.coDriverId
}

/** Finish: the driver, a shop lead, an admin. */
export function canFinishDrive(actor: DriveActor, drive: DriveAccessFacts): boolean {
  if (!canSeeDrive(actor, drive)) return false
  if (actor.role === "admin" || actor.role === "shop_lead") return true
  return actor.id === drive.driverId
}

/**
 * Whether recorded data may still be added. Samples that arrive after Finish but before the review
 * (a phone's outbox flushing late) are accepted and the drive is scored again, so nothing recorded
 * is lost; once a lead has reviewed the drive its record is closed.
 */
export function recordingIsOpen(drive: Pick<DriveAccessFacts, "reviewStatus">): boolean {
  return drive.reviewStatus === null
}

interface TaskDriveFacts {
  /** Tasks whose method is only "static" need no drive. */
  needsDrive: boolean
  /** The task's latest drive (by start), if any. */
  latest: {
    status: "recording" | "finished"
    verdict: Verdict | null
    harshEvents: number
    reviewStatus: ReviewStatus | null
  } | null
}

/** A finished drive needs a lead's look when its verdict is not met or it had harsh events. */
function driveNeedsReview(d: { verdict: string | null; harshEvents: number }): boolean {
  return d.verdict !== "met" || d.harshEvents > 0
}

/**
 * The job's status after one of its drives finished (the shared flow: drive -> review | complete).
 * Review wins when any latest drive (of a task, or of the job without a task) waits for one; complete needs every task that needs a
 * drive to have a finished drive that is met without harsh events, or approved.
 */
function jobStatusAfterFinish(tasks: readonly TaskDriveFacts[]): JobStatus {
  const relevant = tasks.filter((t) => t.needsDrive)
  const waitingForReview = tasks.some(
    (t) => t.latest?.status === "finished" && t.latest.reviewStatus === null && driveNeedsReview(t.latest),
  )
  if (waitingForReview) return "review"
  const allDone =
    relevant.length > 0 &&
    relevant.every(
      (t) =>
        t.latest?.status === "finished" &&
        (t.latest.reviewStatus === "approved" || (t.latest.reviewStatus === null && !driveNeedsReview(t.latest))),
    )
  return allDone ? "complete" : "drive"
}

/** A job's task row and drive row as the job-status rule reads them (drives ascending by start). */
export interface JobTaskRow {
  id: string
  method: string
}
export interface JobDriveRow {
  task_id: string | null
  status: "recording" | "finished"
  verdict: Verdict | null
  review_status: ReviewStatus | null
  harsh_events: number | string
}

/** The job's status from its tasks and all of its drives: each task is held to its latest drive. */
export function jobStatusFromDrives({
  tasks,
  drives,
}: {
  tasks: readonly JobTaskRow[]
  drives: readonly JobDriveRow[]
}): JobStatus {
  const latestByTask = new Map<string | null, JobDriveRow>()
  for (const d of drives) latestByTask.set(d.task_id, d) // ascending by start: the last one wins
  const toFacts = (d: JobDriveRow | undefined): TaskDriveFacts["latest"] =>
    d
      ? { status: d.status, verdict: d.verdict, harshEvents: Number(d.harsh_events), reviewStatus: d.review_status }
      : null
  const facts: TaskDriveFacts[] =
    tasks.length > 0
      ? tasks.map((t) => ({ needsDrive: t.method !== "static", latest: toFacts(latestByTask.get(t.id)) }))
      : [{ needsDrive: true, latest: toFacts(drives.at(-1)) }]
  // Drives on the job without a task count for the job as a whole.
  if (tasks.length > 0 && latestByTask.has(null))
    facts.push({ needsDrive: false, latest: toFacts(latestByTask.get(null)) })
  return jobStatusAfterFinish(facts)
}
