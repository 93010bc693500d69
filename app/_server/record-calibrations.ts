import "server-only"
import type { Db } from "@/db/client"
import { listTasksForJob } from "@/db/queries/jobs"
import { listSetupRecordsForJob, setupJson } from "@/db/queries/setup"
import { measurementLabel } from "@/lib/setup"
import { calibrationCautions, type CalibrationRecord } from "@/lib/record"

/**
 * The record's per-system section (issue 13): for each task of the drive's job, its static set-up, the
 * learn drives made for it, and its checks in the job's latest road test (by start; finished ones first).
 */
export async function loadCalibrations(
  db: Db,
  jobId: string,
  shopId: string,
  thisDriveId: string,
): Promise<CalibrationRecord[]> {
  const [tasks, setups, drives] = await Promise.all([
    listTasksForJob(db, jobId, shopId),
    listSetupRecordsForJob(db, jobId, shopId),
    db
      .selectFrom("drive as d")
      .leftJoin("score as s", (j) => j.onRef("s.drive_id", "=", "d.id").on("s.shop_id", "=", shopId))
      .select(["d.id", "d.public_id", "d.task_id", "d.kind", "d.verdict", "d.status", "d.created_at", "s.result"])
      .where("d.job_id", "=", jobId)
      .where("d.shop_id", "=", shopId)
      .orderBy("d.created_at")
      .execute(),
  ])
  const roadTests = drives.filter((d) => d.kind !== "learn")
  const latestRoadTest = roadTests.filter((d) => d.status === "finished").at(-1) ?? roadTests.at(-1)
  const roadScore = latestRoadTest?.result ?? null
  return tasks.map((t): CalibrationRecord => {
    const setupRow = setups.find((s) => s.task_id === t.id)
    const setup = setupRow ? setupJson(setupRow) : null
    const checks = (roadScore?.roadTest?.checks ?? []).filter((c) => c.system === t.sensor)
    return {
      sensor: t.sensor,
      method: t.method,
      reason: t.reason,
      setup: setup
        ? {
            measurements: setup.measurements.map((m) => ({
              label: measurementLabel(m),
              value: m.value,
              specified: m.specified,
              tolerance: m.tolerance,
              unit: m.unit,
              outOfTolerance: m.outOfTolerance,
            })),
            scanResult: setup.scanResult,
            scanNotes: setup.scanNotes,
            override: setup.override
              ? {
                  note: setup.override.note,
                  by: setup.override.by,
                  at: setup.override.at ? new Date(setup.override.at).toISOString() : null,
                }
              : null,
            recordedBy: setup.updatedBy,
            recordedAt: setup.updatedAt ? new Date(setup.updatedAt).toISOString() : null,
          }
        : null,
      learnDrives: drives
        .filter((d) => d.kind !== "road_test" && d.task_id === t.id)
        .map((d) => ({
          driveId: d.public_id,
          verdict: d.verdict,
          startedAt: new Date(d.created_at).toISOString(),
          thisDrive: d.id === thisDriveId,
        })),
      roadTest: latestRoadTest
        ? {
            driveId: latestRoadTest.public_id,
            verdict: latestRoadTest.verdict,
            thisDrive: latestRoadTest.id === thisDriveId,
            checks: checks.map((c) => ({
              label: c.label,
              need: c.need,
              minSpeedMph: c.minSpeedMph,
              status: c.status,
              speedMph: c.speedMph,
            })),
          }
        : null,
      cautions: calibrationCautions(t.sensor, t.method),
    }
  })
}
