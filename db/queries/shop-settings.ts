import { sql } from "kysely"
import { DEFAULT_TIRE_TOLERANCE_PSI } from "@/lib/checklist"
import { DEFAULT_TIME_ZONE, isTimeZone } from "@/lib/format"
import type { Db } from "../client"
import type { ShopSettings } from "../types"

export type ResolvedShopSettings = {
  units: "imperial" | "metric"
  tirePressureTolerancePsi: number
  timeZone: string
  location: { lat: number; lon: number } | null
  roadKnowledge: boolean
  sampleRetentionMonths: number | null
}

export async function findShopSettings(db: Db, shopId: string): Promise<ResolvedShopSettings> {
  const row = await db.selectFrom("shop").select("settings").where("id", "=", shopId).executeTakeFirst()
  const s: ShopSettings = row?.settings ?? {}
  return {
    units: s.units ?? "imperial",
    tirePressureTolerancePsi: s.tirePressureTolerancePsi ?? DEFAULT_TIRE_TOLERANCE_PSI,
    timeZone: s.timeZone && isTimeZone(s.timeZone) ? s.timeZone : DEFAULT_TIME_ZONE,
    location: s.location ?? null,
    roadKnowledge: s.roadKnowledge ?? true,
    sampleRetentionMonths: s.sampleRetentionMonths ?? null,
  }
}

export async function updateShopSettings(db: Db, shopId: string, changes: ShopSettings) {
  const current = await findShopSettings(db, shopId)
  const next = { ...current, ...Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined)) }
  await db
    .updateTable("shop")
    .set({ settings: JSON.stringify(next) })
    .where("id", "=", shopId)
    .execute()
  return next as ResolvedShopSettings
}

// ---- time zones PostgreSQL knows ------------------------------------------------------------------
// A zone the browser's Intl accepts (it validates the setting) may still be unknown to the database's own zone
// data, and `at time zone` with an unknown name fails the whole query. Saving checks pg_timezone_names; reading
// checks again (a zone stored before this guard, or a database with older zone data) and falls back to UTC.

/** The database's spelling of `zone` (names match case-insensitively, as `at time zone` does), or null. */
export async function findDatabaseTimeZone(db: Db, zone: string): Promise<string | null> {
  const row = await sql<{ name: string }>`
    select name from pg_timezone_names where lower(name) = lower(${zone}) order by name = ${zone} desc limit 1
  `.execute(db)
  return row.rows[0]?.name ?? null
}

// The database's zone data does not change while the server runs: one look-up per zone and process.
const knownZones = new Map<string, string | null>()

const DATABASE_FALLBACK_TIME_ZONE = "UTC"

/**
 * The zone to hand to `at time zone`: the shop's if the database knows it, else UTC. `fellBack` says so, for the
 * page to name the zone it used.
 */
export async function queryTimeZone(db: Db, zone: string): Promise<{ timeZone: string; fellBack: boolean }> {
  let known = knownZones.get(zone)
  if (known === undefined) {
    known = await findDatabaseTimeZone(db, zone)
    knownZones.set(zone, known)
  }
  return known ? { timeZone: known, fellBack: false } : { timeZone: DATABASE_FALLBACK_TIME_ZONE, fellBack: true }
}
