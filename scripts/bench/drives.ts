// Drive ingest figures: they need the running app (BASE_URL) and its database (DATABASE_URL), e.g.
// `npm start` in one shell, then in another
//   BASE_URL=http://127.0.0.1:3000 DATABASE_URL=postgres://postgres@127.0.0.1:54329/straightaway npm run bench
// Without them the two figures are reported as skipped.
// Each run makes a throwaway shop and deletes it (and its drives) at the end.
import { randomUUID } from "node:crypto"
import pg from "pg"
import { driveKey } from "@/db/queries/samples"
import { internalDriveId } from "@/lib/drive-id"
import type { Sample } from "@/lib/drive-file"
import { encodeDegrees, encodeMillis } from "@/lib/drive-file/stored"
import { flushOutbox, makeItem, memoryOutboxStore, type Transport } from "@/lib/recorder/outbox"
import { SEND_MAX_SAMPLES } from "@/lib/recorder/batching"
import { hourAt10Hz } from "./scoring"
import { benchPerson, benchStack, phoneRequest, signInCookie, type BenchStack } from "./rig"
import { APP_ENV, atLeast, below, benchFigure, type BenchContext } from "./types"

interface Rig extends BenchStack {
  userId: string
  transport: Transport
}

/** A throwaway shop with one technician, signed in over HTTP. */
async function rig(ctx: BenchContext): Promise<Rig> {
  return ctx.memo("drives-rig", async () => {
    const stack = await benchStack(ctx.env, "shop")
    const { baseUrl } = stack
    const person = await benchPerson(stack.db, stack.shopId, "technician")
    const userId = person.id
    const address = `bench-${process.pid}-${Date.now()}`
    const cookie = await signInCookie(baseUrl, person, address)
    const phone = { cookie, address }
    const transport: Transport = {
      async request(method, path, body) {
        const { status, text } = await phoneRequest(baseUrl, phone, method, path, body)
        return { status, body: text ? JSON.parse(text) : null }
      },
    }
    return { ...stack, userId, transport }
  })
}

async function newDrive(r: Rig): Promise<string> {
  const id = randomUUID()
  const res = await r.transport.request("POST", "/api/drives", { id, vehicleDescription: "Bench drive" })
  if (res.status !== 201) throw new Error(`bench drive failed: ${res.status}`)
  return id
}

function chunks<T>(list: readonly T[], size: number): T[][] {
  const out: T[][] = []
  for (let i = 0; i < list.length; i += size) out.push(list.slice(i, i + size))
  return out
}

/** A raw multi-row INSERT ... VALUES through pg, the same rows and batch size as the API gets. */
async function rawInsert(databaseUrl: string, driveId: string, shopId: string, samples: readonly Sample[]) {
  const client = new pg.Client({ connectionString: databaseUrl })
  await client.connect()
  try {
    // driveId is the public id the API was given; the row is found by it and the shop
    const { rows: keys } = await client.query("select sample_key from drive where public_id = $1 and shop_id = $2", [
      driveId,
      shopId,
    ])
    const driveKey = Number(keys[0].sample_key)
    const t0 = performance.now()
    for (const batch of chunks(samples, SEND_MAX_SAMPLES)) {
      const values: unknown[] = []
      const rows = batch.map((s, i) => {
        values.push(
          driveKey,
          s.t,
          encodeDegrees(s.lat),
          encodeDegrees(s.lon),
          encodeMillis(s.speed),
          encodeMillis(s.accuracy),
        )
        const b = i * 6
        return `($${b + 1},$${b + 2},$${b + 3},$${b + 4},$${b + 5},$${b + 6})`
      })
      await client.query(
        `insert into sample (drive_key, t, lat, lon, speed, accuracy) values ${rows.join(",")}`,
        values,
      )
    }
    return performance.now() - t0
  } finally {
    await client.end()
  }
}

export const ingestToRawInsertRatio = benchFigure("ingestToRawInsertRatio", atLeast(0.5), APP_ENV, async (ctx) => {
  const r = await rig(ctx)
  const { file } = hourAt10Hz(ctx)
  const apiDrive = await newDrive(r)
  const t0 = performance.now()
  let n = 0
  for (const batch of chunks(file.samples, SEND_MAX_SAMPLES)) {
    const res = await r.transport.request("POST", `/api/drives/${apiDrive}/samples`, {
      batchId: `bench-${n++}`,
      samples: batch,
    })
    if (res.status !== 200) throw new Error(`ingest failed: ${res.status} ${JSON.stringify(res.body)}`)
  }
  const apiMs = performance.now() - t0
  const rawDrive = await newDrive(r)
  const rawMs = await rawInsert(ctx.env.DATABASE_URL!, rawDrive, r.shopId, file.samples)
  const apiRate = file.samples.length / (apiMs / 1000)
  const rawRate = file.samples.length / (rawMs / 1000)
  return apiRate / rawRate
})

export const syncSecondsFor36k = benchFigure("syncSecondsFor36k", below(10, "s"), APP_ENV, async (ctx) => {
  const r = await rig(ctx)
  const { file } = hourAt10Hz(ctx)
  // As the recorder leaves it after an hour offline: the drive's start, then one piece per second.
  const driveId = randomUUID()
  const store = memoryOutboxStore()
  let now = 1
  await store.put([makeItem(driveId, { type: "create-drive", body: { vehicleDescription: "Bench sync" } }, now++)])
  await store.put(
    chunks(file.samples, 10).map((piece, i) =>
      makeItem(driveId, { type: "samples", batchId: `p${i}-${randomUUID().slice(0, 8)}`, samples: piece }, now++),
    ),
  )
  const t0 = performance.now()
  const outcome = await flushOutbox(store, r.transport)
  const seconds = (performance.now() - t0) / 1000
  if (outcome.kind !== "done" || store.items.size !== 0)
    throw new Error(`sync did not finish: ${JSON.stringify(outcome)}`)
  const { n } = await r.db
    .selectFrom("sample")
    .select((eb) => eb.fn.countAll<string>().as("n"))
    .where("drive_key", "=", driveKey(internalDriveId(r.shopId, driveId), r.shopId))
    .executeTakeFirstOrThrow()
  if (Number(n) !== file.samples.length) throw new Error(`sync stored ${n} of ${file.samples.length} samples`)
  await r.cleanup()
  return seconds
})
