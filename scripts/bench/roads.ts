// Road knowledge figures. roadModelUpdateMs: adding one scored 36,000-sample drive to the road model, as
// the scoring path does: Finish has already loaded the drive's file to score it and hands that file on
// (app/api/drives/_service.ts), so what is timed is aggregating it into cells and the upsert: the median of 5 runs.
// roadsPageP95Ms: the Roads page (server-rendered, 10:00, any day) for a lead, with 2,000 drives in the shop's history:
// the 95th percentile of 30 requests after 10 untimed. Both need DATABASE_URL; the page also BASE_URL.
import { sql } from "kysely"
import { createDb, type Db } from "@/db/client"
import { loadDriveFile } from "@/db/queries/drive-file"
import { applyDriveContribution, updateRoadModel } from "@/db/queries/roads"
import { insertSamples } from "@/db/queries/samples"
import { computeDriveContribution } from "@/lib/roads/aggregate"
import { scoreDrive } from "@/lib/scoring"
import { DEMO_ROAD_LAYOUTS, generateRoadDrive } from "@/lib/tracks/roads"
import { hourAt10Hz } from "./scoring"
import { benchDriveRow, benchMarks, benchPerson, benchShop, dropBenchShop, percentileOf, signInCookie } from "./rig"
import { APP_ENV, atMost, benchFigure } from "./types"

const HOME = { lat: 43.8731, lon: -91.9187 }

/** A shop at HOME with one person of `role`. */
async function roadsShop(db: Db, role: "technician" | "shop_lead") {
  const shopId = await benchShop(db, "roads", { location: HOME, timeZone: "America/Chicago" })
  const { id: userId, email, password } = await benchPerson(db, shopId, role)
  return { shopId, userId, email, password }
}

export const roadModelUpdateMs = benchFigure("roadModelUpdateMs", atMost(200, "ms"), ["DATABASE_URL"], async (ctx) => {
  const db = createDb(ctx.env.DATABASE_URL)
  const { shopId, userId } = await roadsShop(db, "technician")
  try {
    const { file } = hourAt10Hz(ctx)
    const drive = await benchDriveRow(db, shopId, userId, file.samples[0]!.t)
    await insertSamples(db, drive.id, shopId, file.samples)
    await benchMarks(db, drive.id, shopId, file.marks)
    // What Finish holds when it updates the model: the drive's file as stored, and its score.
    const stored = await loadDriveFile(db, drive.id, shopId)
    const score = scoreDrive(stored)
    const times: number[] = []
    // the first run adds the drive, the later ones replace it (a drive scored again): both are updates
    for (let run = 0; run < 6; run++) {
      const t0 = performance.now()
      await db.transaction().execute((trx) => updateRoadModel(trx, drive, score, stored))
      if (run > 0) times.push(performance.now() - t0)
    }
    times.sort((a, b) => a - b)
    return times[Math.floor(times.length / 2)]!
  } finally {
    await dropBenchShop(db, shopId)
  }
})

/** The roadsPageP95Ms shop: a lead and 2,000 drives over 10 weeks, 07:00-18:59, on the three invented roads, added as scoring adds them. */
export async function seedRoadsPageShop(db: Db) {
  const shop = await roadsShop(db, "shop_lead")
  const day0 = Date.now() - 70 * 86_400_000
  for (let k = 0; k < 2000; k++) {
    const layout = DEMO_ROAD_LAYOUTS[k % 3]!
    const hour = 7 + (k % 12)
    const startMs =
      Math.floor(day0 / 86_400_000) * 86_400_000 + Math.floor(k / 30) * 86_400_000 + (hour + 6) * 3_600_000
    const file = generateRoadDrive({
      layout,
      seed: 20_000 + k,
      startMs,
      home: HOME,
      traffic: hour === 8 || hour === 17 ? 0.7 : 0.1,
      hz: 0.2,
    })
    const drive = await benchDriveRow(db, shop.shopId, shop.userId, startMs)
    await applyDriveContribution(
      db,
      drive,
      scoreDrive(file).clearedAtSeconds,
      computeDriveContribution(file, "America/Chicago"),
    )
  }
  return shop
}

export const roadsPageP95Ms = benchFigure("roadsPageP95Ms", atMost(100, "ms"), APP_ENV, async (ctx) => {
  const baseUrl = ctx.env.BASE_URL!
  const db = createDb(ctx.env.DATABASE_URL)
  const { shopId, email, password } = await seedRoadsPageShop(db)
  // A shop's history is not 2,000 rows written a moment ago: the statistics are brought up to date now, as
  // autovacuum would have, rather than by an auto-analyze that happens to start among the timed requests.
  await sql`analyze`.execute(db)
  try {
    const cookie = await signInCookie(baseUrl, { email, password }, `bench-roads-${process.pid}`)
    const get = async () => {
      const res = await fetch(`${baseUrl}/roads?hour=10&day=all`, { headers: { cookie } })
      const html = await res.text()
      if (!res.ok || !html.includes('data-testid="road-map"')) throw new Error(`roads page: ${res.status}`)
    }
    for (let i = 0; i < 10; i++) await get()
    const times: number[] = []
    for (let i = 0; i < 30; i++) {
      const t0 = performance.now()
      await get()
      times.push(performance.now() - t0)
    }
    return percentileOf(times, 95)
  } finally {
    await dropBenchShop(db, shopId)
  }
})
