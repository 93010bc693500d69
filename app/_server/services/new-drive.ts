import "server-only"
import type { Db } from "@/db/client"
import { findTaskForDrive, type NewDriveValues } from "@/db/queries/drives"
import { findJobInShop } from "@/db/queries/jobs"
import { findCurrentProfileVersionById, findCurrentProfileVersionByKey } from "@/db/queries/profiles"
import { findUserInShop } from "@/db/queries/users"
import type { DriveActor } from "@/lib/access/drive"
import { internalDriveId } from "@/lib/drive-id"
import { resolveProfile, type Profile } from "@/lib/drive-file"
import { validationFailed } from "@/lib/errors"
import type { CreateDriveInput } from "@/lib/validation/drive"
import { resolveRoadTest } from "@/app/_server/services/road-test"

/**
 * Checks what a new drive refers to (job, task, co-driver, profile: all in the actor's shop; anything
 * else is a 400 naming the field, never a hint about other shops) and freezes the profile it is held to:
 * the task's condition profile (current version), else `profileKey`, else `profile`, else the defaults.
 * `publicId` is the drive's id within the shop; its internal id follows from it (lib/drive-id.ts).
 */
export async function resolveNewDrive(
  db: Db,
  actor: DriveActor,
  publicId: string,
  input: Pick<
    CreateDriveInput,
    "jobId" | "taskId" | "vehicleDescription" | "profileKey" | "profile" | "coDriverId" | "kind" | "roadTestChecks"
  >,
  driverId = actor.id,
): Promise<NewDriveValues> {
  let jobId = input.jobId ?? null
  let taskProfileId: string | null = null
  let taskMethod: string | null = null
  if (input.taskId) {
    const task = await findTaskForDrive(db, input.taskId, actor.shopId)
    if (!task) validationFailed({ taskId: "is not a task of a job in this shop" })
    if (jobId && task.job_id !== jobId) validationFailed({ taskId: "belongs to another job" })
    jobId = task.job_id
    taskProfileId = task.profile_id
    taskMethod = task.method
  }
  let vehicleDescription = input.vehicleDescription?.trim() || null
  if (jobId) {
    const job = await findJobInShop(db, jobId, actor.shopId)
    if (!job) validationFailed({ jobId: "is not a job of this shop" })
    vehicleDescription ??= [job.year, job.make, job.model].filter(Boolean).join(" ") + ` (VIN ${job.vin})`
  }
  let coDriverId: string | null = null
  if (input.coDriverId) {
    const co = await findUserInShop(db, input.coDriverId, actor.shopId)
    if (!co || co.disabled) validationFailed({ coDriverId: "is not a person in this shop" })
    coDriverId = co.id
  }

  let profileVersionId: string | null = null
  let profile: Profile | undefined = input.profile
  const version = taskProfileId
    ? await findCurrentProfileVersionById(db, taskProfileId, actor.shopId)
    : input.profileKey
      ? await findCurrentProfileVersionByKey(db, input.profileKey, actor.shopId, { includeArchived: false })
      : undefined
  if (input.profileKey && !taskProfileId && !version)
    validationFailed({ profileKey: "is not a condition profile of this shop" })
  if (version) {
    profileVersionId = version.versionId
    profile = version.settings
  }
  return {
    id: internalDriveId(actor.shopId, publicId),
    publicId,
    shopId: actor.shopId,
    jobId,
    taskId: input.taskId ?? null,
    vehicleDescription,
    profileVersionId,
    profile: resolveProfile(profile) as unknown as Record<string, unknown>,
    driverId,
    coDriverId,
    ...(await resolveRoadTest(db, actor.shopId, {
      jobId,
      method: taskMethod,
      kind: input.kind,
      checks: input.roadTestChecks,
    })),
  }
}
