import "server-only"
import type { Db } from "@/db/client"
import { findTaskInJob } from "@/db/queries/jobs"
import { AppError, notFound } from "@/lib/errors"

/** The task of the path, which must be a static calibration (static, or static then a drive). */
export async function findStaticTask(db: Db, taskId: string, jobId: string, shopId: string) {
  const task = (await findTaskInJob(db, taskId, jobId, shopId)) ?? notFound("That calibration")
  if (task.method === "dynamic") {
    throw new AppError("conflict", "This calibration is a drive learn (dynamic); it has no target set-up to record.")
  }
  return task
}
