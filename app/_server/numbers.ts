import "server-only"
import type { Db } from "@/db/client"
import { listDrivesForNumbers, loadNumbersSummary } from "@/db/queries/numbers"
import { queryTimeZone } from "@/db/queries/shop-settings"
import { numbersDriveFromRow, type Numbers, type NumbersDrive } from "@/lib/numbers"

export const NUMBERS_DEFAULT_DAYS = 90

/** The shop's finished drives of the last `days` days as plain rows for lib/numbers. */
export async function loadNumbersDrives(db: Db, shopId: string, days: number): Promise<NumbersDrive[]> {
  const since = new Date(Date.now() - days * 86_400_000)
  const rows = await listDrivesForNumbers(db, shopId, since)
  return rows.map(numbersDriveFromRow)
}

type NumbersWithZone = Numbers & {
  /** The zone the weeks were counted in: the shop's, or UTC when the database does not know the shop's. */
  weekTimeZone: string
  /** Said on the page when the weeks fell back to UTC. */
  timeZoneNote: string | null
}

/**
 * What the numbers page shows for the last `days` days, aggregated in the database (computeNumbers' figures);
 * weeks in `timeZone` (the shop's) if PostgreSQL knows it, else in UTC with the page saying so (never a 500).
 */
export async function loadNumbers(db: Db, shopId: string, days: number, timeZone: string): Promise<NumbersWithZone> {
  const zone = await queryTimeZone(db, timeZone)
  const numbers = await loadNumbersSummary(db, shopId, new Date(Date.now() - days * 86_400_000), zone.timeZone)
  return {
    ...numbers,
    weekTimeZone: zone.timeZone,
    timeZoneNote: zone.fellBack
      ? `Weeks are counted in UTC: the database does not know the shop's time zone (${timeZone}). An admin can pick another in Settings.`
      : null,
  }
}
