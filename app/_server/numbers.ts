import "server-only"
import { textStream } from "@/app/_server/text-stream"
import type { ConnectionSource, Db } from "@/db/client"
import { loadNumbersSummary, openNumbersCsv } from "@/db/queries/numbers"
import { queryTimeZone } from "@/db/queries/shop-settings"
import type { Numbers } from "@/lib/numbers"

export const NUMBERS_DEFAULT_DAYS = 90

/**
 * The CSV of the shop's finished drives of the last `days` days, streamed out of PostgreSQL (openNumbersCsv on a
 * connection of `connections`). Times are in `timeZone` (the shop's) if PostgreSQL knows it, else in UTC, as the
 * weeks of loadNumbers; every time carries its UTC offset. A failing statement throws before the first byte.
 */
export async function numbersCsvBody(
  db: Db,
  connections: ConnectionSource,
  shopId: string,
  days: number,
  timeZone: string,
): Promise<ReadableStream<Uint8Array>> {
  const zone = await queryTimeZone(db, timeZone)
  const csv = await openNumbersCsv(db, connections, shopId, new Date(Date.now() - days * 86_400_000), zone.timeZone)
  return textStream(csv.chunks, { close: csv.close })
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
