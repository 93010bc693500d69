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
