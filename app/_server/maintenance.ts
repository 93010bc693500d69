// The app's own scheduler for database upkeep (instrumentation.ts starts it once per server process):
// pg_partman's run_maintenance for `sample` (the months ahead; no pg_partman background worker, so no
// shared_preload_libraries), then every shop's sample retention (db/queries/sample-retention.ts). First run
// shortly after start, then hourly. Several processes may run it at once: run_maintenance takes an
// advisory lock and skips when another holds it, and retention is safe to repeat.
import "server-only"
import { getDb } from "@/db/client"
import { applySampleRetention, runPartitionMaintenance } from "@/db/queries/sample-retention"

const FIRST_RUN_MS = 5_000
const EVERY_MS = 60 * 60 * 1000

const globalForMaintenance = globalThis as unknown as { straightawayMaintenance?: NodeJS.Timeout }

async function runMaintenanceOnce(): Promise<void> {
  const db = getDb()
  try {
    await runPartitionMaintenance(db)
  } catch (error) {
    console.error("[straightaway] partition maintenance failed:", (error as Error).message)
  }
  try {
    const { deletedSamples, droppedPartitions } = await applySampleRetention(db)
    if (deletedSamples > 0 || droppedPartitions.length > 0) {
      console.log(
        `[straightaway] sample retention: ${deletedSamples} samples deleted, months dropped: ${droppedPartitions.join(", ") || "none"}`,
      )
    }
  } catch (error) {
    console.error("[straightaway] sample retention failed:", (error as Error).message)
  }
}

/** Starts the hourly upkeep (once per process; SAMPLE_MAINTENANCE=off leaves it to an operator's cron). */
export function startMaintenance(): void {
  if (process.env.SAMPLE_MAINTENANCE === "off" || globalForMaintenance.straightawayMaintenance) return
  const first = setTimeout(() => void runMaintenanceOnce(), FIRST_RUN_MS)
  first.unref()
  const timer = setInterval(() => void runMaintenanceOnce(), EVERY_MS)
  timer.unref()
  globalForMaintenance.straightawayMaintenance = timer
}
