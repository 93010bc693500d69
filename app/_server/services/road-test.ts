// Road tests (issue 13): what a new drive is for, the checks it is held to, the set-up that must be in
// tolerance before it starts, and check marks that must name one of its checks.
import "server-only"
import type { Db } from "@/db/client"
import { listTasksForJob } from "@/db/queries/jobs"
import { findCurrentProfileVersionById, findDefaultProfileForSensor } from "@/db/queries/profiles"
import { listSetupRecordsForJob, setupJson } from "@/db/queries/setup"
import type { Drive } from "@/db/types"
import {
  defaultRoadTestChecks,
  hasRoadTest,
  mergeRoadTestChecks,
  type ApiMark,
  type DriveKind,
  type RoadTestCheck,
} from "@/lib/drive-file"
import { AppError, validationFailed } from "@/lib/errors"
import { SENSOR_LABEL } from "@/lib/labels"
import { describeMeasurement, isOutOfTolerance } from "@/lib/setup"

/** A task's method says what its drive is for unless the caller says: static -> road test, both -> learn and road test. */
function driveKindFor(method: string | null | undefined, asked: DriveKind | undefined): DriveKind {
  if (asked) return asked
  if (method === "static") return "road_test"
  if (method === "both") return "learn_and_road_test"
  return "learn"
}

/** The road-test checks of one task: its profile's, else the shop's default profile for the sensor, else the built-in defaults. */
async function checksForTask(
  db: Db,
  shopId: string,
  task: { sensor: string; profile_id: string | null },
): Promise<RoadTestCheck[]> {
  const profileId = task.profile_id ?? (await findDefaultProfileForSensor(db, task.sensor, shopId))?.id
  const version = profileId ? await findCurrentProfileVersionById(db, profileId, shopId) : undefined
  return version ? version.roadTestChecks : defaultRoadTestChecks(task.sensor)
}

/**
 * The kind and frozen checks of a new drive. A road test on a job checks every system of the job (a shop
 * that calibrates four systems road-tests all four on one drive); without a job, the checks sent, else
 * the forward radar's defaults.
 */
export async function resolveRoadTest(
  db: Db,
  shopId: string,
  v: { jobId: string | null; method: string | null; kind?: DriveKind; checks?: RoadTestCheck[] },
): Promise<{ kind: DriveKind; roadTest: RoadTestCheck[] | null }> {
  const kind = driveKindFor(v.method, v.kind)
  if (!hasRoadTest(kind)) return { kind, roadTest: null }
  if (v.checks?.length) return { kind, roadTest: v.checks }
  if (v.jobId) {
    const tasks = await listTasksForJob(db, v.jobId, shopId)
    const lists = await Promise.all(tasks.map((t) => checksForTask(db, shopId, t)))
    const checks = mergeRoadTestChecks(lists)
    if (checks.length) return { kind, roadTest: checks }
  }
  return { kind, roadTest: defaultRoadTestChecks("forward_radar") }
}

/** 409 while any static set-up of the job has a measurement out of tolerance that no lead has overridden. */
export async function assertRoadTestMayStart(db: Db, shopId: string, jobId: string): Promise<void> {
  const [tasks, setups] = await Promise.all([
    listTasksForJob(db, jobId, shopId),
    listSetupRecordsForJob(db, jobId, shopId),
  ])
  const problems: string[] = []
  for (const row of setups) {
    if (!setupJson(row).blocksRoadTest) continue
    const task = tasks.find((t) => t.id === row.task_id)
    const system = task ? (SENSOR_LABEL[task.sensor] ?? task.sensor) : "A system"
    const out = row.measurements.filter(isOutOfTolerance).map(describeMeasurement)
    problems.push(`${system}: ${out.join("; ")}`)
  }
  if (problems.length) {
    throw new AppError(
      "conflict",
      `The road test cannot start: set-up measurements are out of tolerance (${problems.join(". ")}). Correct the set-up and record the new figures, or ask a shop lead to override with a note.`,
    )
  }
}

/** Check marks must name one of the drive's road-test checks (400 naming the mark). */
export function assertCheckMarksFit(drive: Drive, marks: readonly ApiMark[]): void {
  const keys = new Set((drive.road_test ?? []).map((c) => c.key))
  const fields: Record<string, string> = {}
  marks.forEach((m, i) => {
    if (m.kind !== "check" || m.checkKey === undefined || keys.has(m.checkKey)) return
    fields[`marks.${i}.checkKey`] = keys.size
      ? "is not one of this drive's road-test checks"
      : "this drive is not a road test: it has no checks"
  })
  if (Object.keys(fields).length) validationFailed(fields)
}
