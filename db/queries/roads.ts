// The road model in PostgreSQL. A scored drive adds its contribution cell by cell (one upsert); scoring it
// again takes the old contribution back out in the same statement. Views read the stored totals only.
import { sql } from "kysely"
import type { AnyDriveFile } from "@/lib/drive-file/schema"
import {
  ALL,
  SPEED_BUCKETS,
  computeDriveContribution,
  locationFromStarts,
  matchLoop,
  mergeStat,
  statsFromStored,
  type CellStat,
  type CellTotals,
  type DriveContribution,
  type LoopDrive,
  type StoredBucket,
} from "@/lib/roads"
import type { Score } from "@/lib/scoring"
import type { Db } from "../client"
import { selectInShop } from "./shop-scope"
import type { Drive } from "../types"
import { loadDriveFile } from "./drive-file"
import { findShopSettings } from "./shop-settings"

const UPSERT_CHUNK = 2000

/**
 * Adds a scored drive to its shop's road model (or replaces what an earlier score of it added).
 * Nothing happens when the shop has turned road knowledge off. Call inside the scoring transaction.
 */
export async function updateRoadModel(
  db: Db,
  drive: Pick<Drive, "id" | "shop_id" | "profile_version_id">,
  score: Pick<Score, "clearedAtSeconds">,
  file?: AnyDriveFile,
) {
  const settings = await findShopSettings(db, drive.shop_id)
  if (!settings.roadKnowledge) return
  const contribution = computeDriveContribution(
    file ?? (await loadDriveFile(db, drive.id, drive.shop_id)),
    settings.timeZone,
  )
  await applyDriveContribution(db, drive, score.clearedAtSeconds, contribution)
}

export async function applyDriveContribution(
  db: Db,
  drive: Pick<Drive, "id" | "shop_id" | "profile_version_id">,
  clearedSeconds: number | null,
  { stats, buckets, summary }: DriveContribution,
) {
  const shopId = drive.shop_id
  await bumpRoadModelVersion(db, shopId)
  const old = await db
    .selectFrom("road_drive")
    .select(["contribution", "loop_id"])
    .where("drive_id", "=", drive.id)
    .where("shop_id", "=", shopId)
    .executeTakeFirst()
  const delta = new Map<string, CellStat>()
  const keyOf = (s: CellStat) => `${s.cell}|${s.hour}|${s.weekday}`
  for (const s of stats) delta.set(keyOf(s), s)
  for (const s of old ? statsFromStored(old.contribution as StoredBucket[]) : []) {
    const k = keyOf(s)
    const cur = delta.get(k)
    delta.set(
      k,
      cur
        ? mergeStat(cur, s, -1)
        : mergeStat(
            {
              ...s,
              seconds: 0,
              qualifyingSeconds: 0,
              followingSeconds: 0,
              harshEvents: 0,
              speedHist: s.speedHist.map(() => 0),
            },
            s,
            -1,
          ),
    )
  }
  // One order for every writer, so two drives scored at once lock the shared cell rows in the same order.
  const ordered = [...delta.values()].sort(
    (a, b) => a.hour - b.hour || a.weekday - b.weekday || (a.cell < b.cell ? -1 : a.cell > b.cell ? 1 : 0),
  )
  // One statement with one array per column (not a parameter per value): a long drive touches ~1,000 rows.
  // The speed histograms travel as one flat array, each row taking its slice of SPEED_BUCKETS values.
  for (let i = 0; i < ordered.length; i += UPSERT_CHUNK) {
    const part = ordered.slice(i, i + UPSERT_CHUNK)
    const hists = `{${part.map((x) => x.speedHist.join(",")).join(",")}}`
    await sql`
      insert into road_cell_stat (shop_id, cell, hour, weekday, seconds, qualifying_seconds, following_seconds, harsh_events, speed_hist)
      select ${shopId}::uuid, u.cell, u.hour, u.weekday, u.seconds, u.q, u.f, u.h, hist.a[(u.i - 1) * ${SPEED_BUCKETS}::int + 1 : u.i * ${SPEED_BUCKETS}::int]
      from (select ${hists}::float8[] as a) as hist, unnest(
        ${part.map((x) => x.cell)}::text[], ${part.map((x) => x.hour)}::int2[], ${part.map((x) => x.weekday)}::int2[],
        ${part.map((x) => x.seconds)}::float8[], ${part.map((x) => x.qualifyingSeconds)}::float8[], ${part.map((x) => x.followingSeconds)}::float8[],
        ${part.map((x) => x.harshEvents)}::int4[]
      ) with ordinality as u(cell, hour, weekday, seconds, q, f, h, i)
      on conflict (shop_id, hour, weekday, cell) do update set
        seconds = road_cell_stat.seconds + excluded.seconds,
        qualifying_seconds = road_cell_stat.qualifying_seconds + excluded.qualifying_seconds,
        following_seconds = road_cell_stat.following_seconds + excluded.following_seconds,
        harsh_events = road_cell_stat.harsh_events + excluded.harsh_events,
        speed_hist = array(select coalesce(a, 0) + coalesce(b, 0) from unnest(road_cell_stat.speed_hist, excluded.speed_hist) with ordinality as u(a, b, i) order by i)
    `.execute(db)
  }
  if (!summary) {
    await db.deleteFrom("road_drive").where("drive_id", "=", drive.id).where("shop_id", "=", shopId).execute()
    return
  }
  const profileId = drive.profile_version_id
    ? ((
        await db
          .selectFrom("condition_profile_version")
          .select("profile_id")
          .where("id", "=", drive.profile_version_id)
          .where("shop_id", "=", shopId)
          .executeTakeFirst()
      )?.profile_id ?? null)
    : null
  const loopId = old?.loop_id ?? (await loopFor(db, shopId, summary.loopCells))
  const values = {
    profile_id: profileId,
    loop_id: loopId,
    started_at: new Date(summary.startedAtMs),
    hour: summary.start.hour,
    weekday: summary.start.weekday,
    start_lat: summary.startLat,
    start_lon: summary.startLon,
    driven_seconds: summary.drivenSeconds,
    qualifying_seconds: summary.qualifyingSeconds,
    following_seconds: summary.followingSeconds,
    harsh_events: summary.harshEvents,
    cleared_seconds: clearedSeconds,
    route: summary.route,
    track: JSON.stringify(summary.track),
    contribution: JSON.stringify(buckets),
  }
  await db
    .insertInto("road_drive")
    .values({ drive_id: drive.id, shop_id: shopId, ...values })
    .onConflict((oc) => oc.column("drive_id").doUpdateSet({ ...values, updated_at: sql`now()` }))
    .execute()
}

/** A new token for the shop's road model (taken in the writer's transaction, so it serialises the shop's writers). */
export async function bumpRoadModelVersion(db: Db, shopId: string) {
  await sql`insert into road_model (shop_id) values (${shopId}) on conflict (shop_id) do update set version = gen_random_uuid(), updated_at = now()`.execute(
    db,
  )
}

/** The token of the shop's road model as it is now; null when the shop has none. */
export async function findRoadModelVersion(db: Db, shopId: string): Promise<string | null> {
  return (
    (await db.selectFrom("road_model").select("version").where("shop_id", "=", shopId).executeTakeFirst())?.version ??
    null
  )
}

async function loopFor(db: Db, shopId: string, cells: string[]): Promise<string> {
  const loops = await db
    .selectFrom("road_loop")
    .select(["id", "cells", "number"])
    .where("shop_id", "=", shopId)
    .execute()
  const match = matchLoop(cells, loops)
  if (match) return match.id
  const number = loops.reduce((m, l) => Math.max(m, l.number), 0) + 1
  const { id } = await db
    .insertInto("road_loop")
    .values({ shop_id: shopId, number, cells })
    .returning("id")
    .executeTakeFirstOrThrow()
  return id
}

/** Removes every figure of the shop's road model (turning the feature off). */
export async function deleteRoadModel(db: Db, shopId: string) {
  await db.deleteFrom("road_model").where("shop_id", "=", shopId).execute()
  await db.deleteFrom("road_drive").where("shop_id", "=", shopId).execute()
  await db.deleteFrom("road_cell_stat").where("shop_id", "=", shopId).execute()
  await db.deleteFrom("road_loop").where("shop_id", "=", shopId).execute()
}

/** Cell totals for one local hour (any day), one weekday (any hour), or all times (both null). */
export async function listCellTotals(
  db: Db,
  shopId: string,
  slot: { hour: number | null; weekday: number | null },
): Promise<CellTotals[]> {
  const rows = await db
    .selectFrom("road_cell_stat")
    .select(["cell", "seconds", "qualifying_seconds", "following_seconds", "harsh_events", "speed_hist"])
    .where("shop_id", "=", shopId)
    .where("hour", "=", slot.hour ?? ALL)
    .where("weekday", "=", slot.weekday ?? ALL)
    .where("seconds", ">", 1)
    .execute()
  return rows.map((r) => ({
    cell: r.cell,
    seconds: r.seconds,
    qualifyingSeconds: r.qualifying_seconds,
    followingSeconds: r.following_seconds,
    harshEvents: r.harsh_events,
    speedHist: r.speed_hist,
  }))
}

/** The drives the loops are ranked from; `hours` narrows to drives that started in those local hours. */
export async function listLoopDrives(db: Db, shopId: string, hours?: number[]): Promise<LoopDrive[]> {
  let q = db
    .selectFrom("road_drive")
    .select([
      "drive_id",
      "loop_id",
      "profile_id",
      "hour",
      "weekday",
      "start_lat",
      "start_lon",
      "driven_seconds",
      "qualifying_seconds",
      "cleared_seconds",
    ])
    .where("shop_id", "=", shopId)
  if (hours) q = q.where("hour", "in", hours)
  const rows = await q.execute()
  return rows.map((r) => ({
    driveId: r.drive_id,
    loopId: r.loop_id,
    profileId: r.profile_id,
    hour: r.hour,
    weekday: r.weekday,
    startLat: r.start_lat,
    startLon: r.start_lon,
    drivenSeconds: r.driven_seconds,
    qualifyingSeconds: r.qualifying_seconds,
    clearedSeconds: r.cleared_seconds,
  }))
}

export async function listLoops(db: Db, shopId: string) {
  return db
    .selectFrom("road_loop")
    .select(["id", "number", "name"])
    .where("shop_id", "=", shopId)
    .orderBy("number")
    .execute()
}

/** The road tracks of these drives (internal ids), each with the drive's public id, the one the API shows. */
export async function findRoadTracks(
  db: Db,
  shopId: string,
  driveIds: string[],
): Promise<Map<string, { publicId: string; track: [number, number][] }>> {
  if (!driveIds.length) return new Map()
  const rows = await db
    .selectFrom("road_drive")
    .innerJoin("drive", (j) => j.onRef("drive.id", "=", "road_drive.drive_id").on("drive.shop_id", "=", shopId))
    .select(["road_drive.drive_id", "drive.public_id", "road_drive.track"])
    .where("road_drive.shop_id", "=", shopId)
    .where("road_drive.drive_id", "in", driveIds)
    .execute()
  return new Map(rows.map((r) => [r.drive_id, { publicId: r.public_id, track: r.track }]))
}

/** The shop's place from where its drives start (median of up to the last 500 starts). */
export async function findLocationFromStarts(db: Db, shopId: string) {
  const rows = await selectInShop(db, "road_drive", shopId)
    .select(["start_lat", "start_lon"])
    .orderBy("started_at", "desc")
    .limit(500)
    .execute()
  return locationFromStarts(rows.map((r) => ({ lat: r.start_lat, lon: r.start_lon })))
}

export async function findLoopInShop(db: Db, loopId: string, shopId: string) {
  return selectInShop(db, "road_loop", shopId)
    .select(["id", "number", "name"])
    .where("id", "=", loopId)
    .executeTakeFirst()
}

export async function listDrivesOfLoop(db: Db, loopId: string, shopId: string) {
  return selectInShop(db, "road_drive", shopId)
    .innerJoin("drive", (j) => j.onRef("drive.id", "=", "road_drive.drive_id").on("drive.shop_id", "=", shopId))
    .select([
      "drive.public_id as drive_id", // the id the shop knows the drive by
      "road_drive.started_at",
      "road_drive.hour",
      "road_drive.weekday",
      "road_drive.driven_seconds",
      "road_drive.qualifying_seconds",
      "road_drive.cleared_seconds",
    ])
    .where("road_drive.loop_id", "=", loopId)
    .orderBy("road_drive.started_at", "desc")
    .execute()
}

/** How many drives the shop's road model holds, and how many of them completed the learn. */
export async function countRoadDrives(db: Db, shopId: string) {
  const row = await selectInShop(db, "road_drive", shopId)
    .select((e) => [e.fn.countAll<string>().as("drives"), e.fn.count<string>("cleared_seconds").as("completed")])
    .executeTakeFirstOrThrow()
  return { drives: Number(row.drives), completed: Number(row.completed) }
}
