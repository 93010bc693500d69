// The demo shop's road history: a few hundred generated drives on three invented roads around the shop
// (lib/tracks/roads), at different hours, scored and added to the road model the same way a finished
// drive is. Idempotent: once the history exists, re-running changes nothing.
import { createHash } from "node:crypto"
import { internalDriveId } from "@/lib/drive-id"
import { resolveProfile } from "@/lib/drive-file/profile"
import { storedSample } from "@/lib/drive-file/stored"
import { computeDriveContribution } from "@/lib/roads/aggregate"
import { localSlot } from "@/lib/roads/clock"
import { scoreDrive } from "@/lib/scoring"
import { createRng } from "@/lib/tracks"
import { DEMO_ROAD_LAYOUTS, generateRoadDrive, type RoadLayout } from "@/lib/tracks/roads"
import type { Db } from "./client"
import { markRow } from "./queries/marks"
import { applyDriveContribution, bumpRoadModelVersion } from "./queries/roads"
import { insertSamples } from "./queries/samples"
import { upsertScore } from "./queries/scores"
import { selectInShop } from "./queries/shop-scope"
import { findShopSettings, updateShopSettings } from "./queries/shop-settings"

/** An invented spot in the US Midwest for the invented demo shop. */
const DEMO_SHOP_LOCATION = { lat: 43.8731, lon: -91.9187 }
const DEMO_TIME_ZONE = "America/Chicago"
const HISTORY_DRIVES = 300
const HISTORY_DAYS = 70
const HISTORY_TAG = "Road history"

/** Traffic (0 free .. 1 heavy) on each invented road by local hour: rush hours slow the parkway and the avenue. */
function demoTraffic(layout: RoadLayout, hour: number): number {
  const rush = hour === 7 || hour === 8 || hour === 16 || hour === 17
  if (layout.kind === "steady") return rush ? 0.75 : 0.05
  if (layout.kind === "stop-and-go") return rush ? 0.8 : hour >= 11 && hour <= 13 ? 0.4 : 0.15
  return 0.1
}

function uuidFrom(text: string): string {
  const h = createHash("sha256").update(text).digest("hex")
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-a${h.slice(17, 20)}-${h.slice(20, 32)}`
}

function utcForLocal(dayMs: number, hour: number, minute: number, zone: string): number {
  let t = dayMs + (hour + 6) * 3_600_000 + minute * 60_000
  for (let i = 0; i < 3 && localSlot(t, zone).hour !== hour; i++) t += (hour - localSlot(t, zone).hour) * 3_600_000
  return t
}

/** `drives`: how many to generate; `hours`: local hours to spread them over (default 07:00-18:00, shop hours). */
export async function seedRoadHistory(
  db: Db,
  shopId: string,
  { nowMs = Date.now(), drives = HISTORY_DRIVES, hours }: { nowMs?: number; drives?: number; hours?: number[] } = {},
) {
  const settings = await findShopSettings(db, shopId)
  if (!settings.location)
    await updateShopSettings(db, shopId, { location: DEMO_SHOP_LOCATION, timeZone: DEMO_TIME_ZONE })
  const already = await db
    .selectFrom("drive")
    .select("id")
    .where("shop_id", "=", shopId)
    .where("vehicle_description", "like", `${HISTORY_TAG}%`)
    .limit(1)
    .executeTakeFirst()
  if (already) return 0
  const { location, timeZone, roadKnowledge } = await findShopSettings(db, shopId)
  const tech = await db
    .selectFrom("app_user")
    .select("id")
    .where("shop_id", "=", shopId)
    .where("role", "=", "technician")
    .orderBy("email")
    .executeTakeFirst()
  const profile = await db
    .selectFrom("condition_profile as p")
    .innerJoin("condition_profile_version as v", (j) =>
      j.onRef("v.profile_id", "=", "p.id").onRef("v.version", "=", "p.current_version"),
    )
    .select(["v.id as version_id", "v.settings"])
    .where("p.shop_id", "=", shopId)
    .where("p.key", "=", "forward-radar")
    .executeTakeFirst()
  if (!tech || !location) return 0
  const resolved = resolveProfile((profile?.settings ?? {}) as never)
  const rng = createRng(14_2026)
  const today = Math.floor(nowMs / 86_400_000) * 86_400_000
  const loopNames = new Map<string, string>()
  let made = 0
  for (let k = 0; k < drives; k++) {
    const layout = DEMO_ROAD_LAYOUTS[k % DEMO_ROAD_LAYOUTS.length]!
    const draw = rng()
    const hour = hours ? hours[Math.floor(draw * hours.length)]! : 7 + Math.floor(draw * 12) // 07:00-18:59, when the shop drives
    const day = today - (1 + Math.floor(rng() * HISTORY_DAYS)) * 86_400_000
    const startMs = utcForLocal(day, hour, Math.floor(rng() * 60), timeZone)
    if (localSlot(startMs, timeZone).weekday === 0) continue // closed on Sundays
    const generated = generateRoadDrive({
      layout,
      seed: 90_000 + k,
      startMs,
      home: location,
      traffic: demoTraffic(layout, hour),
      hz: 0.25,
      profile: resolved,
    })
    const file = { ...generated, samples: generated.samples.map(storedSample) } // scored as stored
    const score = scoreDrive(file)
    const publicId = uuidFrom(`${shopId}:road-history:${k}`)
    const id = internalDriveId(shopId, publicId)
    const drive = { id, public_id: publicId, shop_id: shopId, profile_version_id: profile?.version_id ?? null }
    await db.transaction().execute(async (trx) => {
      await trx
        .insertInto("drive")
        .values({
          ...drive,
          vehicle_description: `${HISTORY_TAG}: ${layout.name}`,
          profile: JSON.stringify(resolved),
          driver_id: tech.id,
          status: "finished",
          verdict: score.verdict,
          review_status: "approved",
          created_at: new Date(startMs),
          finished_at: new Date(score.endedAtMs ?? startMs),
        })
        .execute()
      await insertSamples(trx, id, shopId, file.samples)
      await trx
        .insertInto("mark")
        .values(
          file.marks.map((m, i) =>
            markRow(m, { id: uuidFrom(`${id}:mark:${i}`), driveId: id, shopId, createdBy: tech.id }),
          ),
        )
        .execute()
      await upsertScore(trx, id, shopId, score)
      if (roadKnowledge)
        await applyDriveContribution(trx, drive, score.clearedAtSeconds, computeDriveContribution(file, timeZone))
    })
    if (!loopNames.has(layout.key)) loopNames.set(layout.key, id)
    made++
  }
  // Name each loop after the invented road its drives took.
  for (const layout of DEMO_ROAD_LAYOUTS) {
    const driveId = loopNames.get(layout.key)
    if (!driveId) continue
    const row = await selectInShop(db, "road_drive", shopId)
      .select("loop_id")
      .where("drive_id", "=", driveId)
      .executeTakeFirst()
    if (row?.loop_id)
      await db
        .updateTable("road_loop")
        .set({ name: layout.name })
        .where("id", "=", row.loop_id)
        .where("shop_id", "=", shopId)
        .where("name", "is", null)
        .execute()
  }
  await bumpRoadModelVersion(db, shopId)
  return made
}
