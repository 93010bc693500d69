import { sql } from "kysely"
import { resolveProfile } from "@/lib/drive-file/profile"
import { MILLI_SCALE } from "@/lib/drive-file/stored"
import type { Sample } from "@/lib/drive-file/schema"
import { notFound } from "@/lib/errors"
import type { Around, DriveFileHead, GpxLookahead } from "@/lib/export/stream"
import type { Db } from "../client"
import { driveFileOf } from "./drive-file"
import { findDriveInShop } from "./drives"
import { listMarks } from "./marks"
import { driveKey, SAMPLE_COLUMNS, sampleOfRow, type SampleRow } from "./samples"

/** Rows per FETCH: a few hundred kB of rows at a time, whatever the drive's length. */
export const EXPORT_FETCH_ROWS = 2000

export interface DriveExport {
  /** The drive file with `samples: []`. */
  head: DriveFileHead
  /** Only when asked for (`gpx: true`). */
  lookahead: GpxLookahead | null
  /** The samples by time, EXPORT_FETCH_ROWS at a time from a server-side cursor; ends the transaction when done. */
  samples: AsyncGenerator<Sample[]>
  /** Ends the transaction (and the cursor) early; safe to call more than once. */
  close(): Promise<void>
}

/**
 * Opens a drive for a streamed export: one read-only REPEATABLE READ transaction holds one connection, so the
 * head (drive, marks), the GPX's look-ahead and every sample come from the same snapshot, and a cursor
 * (DECLARE ... CURSOR, FETCH FORWARD) hands the samples over a chunk at a time. Another shop's drive (or none)
 * is a not_found AppError, thrown before anything is sent. The caller must drain `samples` or call close().
 */
export async function openDriveExport(
  db: Db,
  driveId: string,
  shopId: string,
  { gpx = false } = {},
): Promise<DriveExport> {
  const trx = await db.startTransaction().setIsolationLevel("repeatable read").setAccessMode("read only").execute()
  let open = true
  const close = async () => {
    if (!open) return
    open = false
    // Read-only: rolling back and committing are the same; rollback releases the connection even if it fails.
    await trx
      .rollback()
      .execute()
      .catch(() => {})
  }
  try {
    const drive = await findDriveInShop(trx, driveId, shopId)
    if (!drive) notFound("That drive")
    const head = driveFileOf(drive, [], await listMarks(trx, driveId, shopId))
    const lookahead = gpx
      ? await gpxLookahead(
          trx,
          driveId,
          shopId,
          resolveProfile(head.profile).maxAccuracyM,
          head.marks.map((m) => m.t),
        )
      : null
    await sql`declare drive_export no scroll cursor for
      select ${sql.join(SAMPLE_COLUMNS.map((c) => sql.ref(c)))} from sample
      where drive_key = ${driveKey(driveId, shopId)}
      order by t`.execute(trx)
    async function* samples(): AsyncGenerator<Sample[]> {
      try {
        while (open) {
          const { rows } =
            await sql<SampleRow>`fetch forward ${sql.raw(String(EXPORT_FETCH_ROWS))} from drive_export`.execute(trx)
          if (rows.length > 0) yield rows.map(sampleOfRow)
          if (rows.length < EXPORT_FETCH_ROWS) break
        }
      } finally {
        await close()
      }
    }
    return { head, lookahead, samples: samples(), close }
  } catch (error) {
    await close()
    throw error
  }
}

/**
 * The first kept sample's time and, for each mark time, the kept samples either side (the last at or before it,
 * the first after it): what GPX writes before its first track point. Kept is rule 1 of drive-file.md (accuracy
 * within the profile's limit; `t` is unique per drive in the table). One statement.
 */
async function gpxLookahead(
  db: Db,
  driveId: string,
  shopId: string,
  maxAccuracyM: number,
  markTimes: number[],
): Promise<GpxLookahead> {
  const times = [...new Set(markTimes)]
  // Accuracy is stored in mm (lib/drive-file/stored.ts); dividing in float8 here is the same IEEE division decodeSample does.
  const kept = sql`drive_key = ${driveKey(driveId, shopId)} and (accuracy is null or accuracy::float8 / ${MILLI_SCALE}::float8 <= ${maxAccuracyM}::float8)`
  const cols = sql.join(SAMPLE_COLUMNS.map((c) => sql.ref(c)))
  const { rows } = await sql<{
    ms: number | null
    side: "first" | "before" | "after"
    t: number
    lat: number
    lon: number
    speed: number | null
    accuracy: number | null
  }>`
    select null::bigint as ms, 'first' as side, f.* from (select ${cols} from sample where ${kept} order by t asc limit 1) f
    union all
    select m.ms, 'before', b.* from unnest(${times}::bigint[]) as m(ms)
      cross join lateral (select ${cols} from sample where ${kept} and t <= m.ms order by t desc limit 1) b
    union all
    select m.ms, 'after', a.* from unnest(${times}::bigint[]) as m(ms)
      cross join lateral (select ${cols} from sample where ${kept} and t > m.ms order by t asc limit 1) a`.execute(db)
  let firstKeptT: number | undefined
  const around = new Map<number, Around>()
  for (const { ms, side, ...row } of rows) {
    if (side === "first") {
      firstKeptT = row.t
      continue
    }
    const entry = around.get(ms!) ?? {}
    entry[side] = sampleOfRow(row)
    around.set(ms!, entry)
  }
  return { firstKeptT, around }
}
