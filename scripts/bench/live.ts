// Live channel figures (app/_server/live.ts): they need the running app (BASE_URL) and its database
// (DATABASE_URL), like the drive ingest figures. Each run makes a throwaway shop and deletes it at the end.
import { randomUUID } from "node:crypto"
import { SEND_MAX_SAMPLES } from "@/lib/recorder/batching"
import { hourAt10Hz } from "./scoring"
import { benchLogin, benchPerson, benchStack, percentileOf, phoneRequest, signInCookie } from "./rig"
import type { BenchStack, Phone } from "./rig"
import { APP_ENV, atMost, below, benchFigure, type BenchContext } from "./types"

interface Crew extends BenchStack {
  driver: Phone
  codriver: Phone
  codriverId: string
}

async function crew(ctx: BenchContext): Promise<Crew> {
  return ctx.memo("live-crew", async () => {
    const stack = await benchStack(ctx.env, "live")
    const login = await benchLogin()
    const person = async (role: "technician" | "co_driver"): Promise<Phone & { id: string }> => {
      const someone = await benchPerson(stack.db, stack.shopId, role, login)
      const address = `bench-live-${someone.id.slice(0, 8)}`
      return { id: someone.id, address, cookie: await signInCookie(stack.baseUrl, someone, address) }
    }
    const driver = await person("technician")
    const codriver = await person("co_driver")
    return { ...stack, driver, codriver, codriverId: codriver.id }
  })
}

async function call(c: Crew, phone: Phone, method: string, path: string, body?: unknown) {
  const { status, text } = await phoneRequest(c.baseUrl, phone, method, path, body)
  if (status >= 300) throw new Error(`${method} ${path}: ${status} ${text}`)
  return text ? JSON.parse(text) : null
}

export const liveFanoutP95Seconds = benchFigure("liveFanoutP95Seconds", below(1, "s"), APP_ENV, async (ctx) => {
  const c = await crew(ctx)
  const driveId = randomUUID()
  await call(c, c.driver, "POST", "/api/drives", {
    id: driveId,
    vehicleDescription: "Bench live",
    coDriverId: c.codriverId,
  })
  // Some driving first, so every mark falls inside the drive.
  const { file } = hourAt10Hz(ctx)
  const driven = file.samples.slice(0, 1100)
  await call(c, c.driver, "POST", `/api/drives/${driveId}/samples`, { batchId: "driven", samples: driven })
  // The driver's phone holds the stream open; the co-driver's phone posts marks, one at a time.
  const abort = new AbortController()
  const res = await fetch(`${c.baseUrl}/api/drives/${driveId}/live`, {
    headers: { cookie: c.driver.cookie, "x-forwarded-for": c.driver.address, accept: "text/event-stream" },
    signal: abort.signal,
  })
  if (res.status !== 200) throw new Error(`live stream: ${res.status}`)
  const arrived = new Map<string, number>()
  let wake = null as (() => void) | null
  let snapshot = false
  void (async () => {
    const decoder = new TextDecoder()
    let buffer = ""
    try {
      for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
        buffer += decoder.decode(chunk, { stream: true })
        let cut: number
        while ((cut = buffer.indexOf("\n\n")) >= 0) {
          const block = buffer.slice(0, cut)
          buffer = buffer.slice(cut + 2)
          const event = /^event: (.*)$/m.exec(block)?.[1]
          const data = /^data: (.*)$/m.exec(block)?.[1]
          if (event === "snapshot") snapshot = true
          if (event === "mark" && data) arrived.set((JSON.parse(data) as { id: string }).id, performance.now())
          wake?.()
        }
      }
    } catch {
      // aborted at the end
    }
  })()
  const until = async (ok: () => boolean, ms = 10_000) => {
    const deadline = performance.now() + ms
    while (!ok()) {
      if (performance.now() > deadline) throw new Error("live bench: nothing arrived in time")
      await new Promise<void>((r) => {
        wake = r
        setTimeout(r, 50)
      })
    }
  }
  await until(() => snapshot)
  const seconds: number[] = []
  for (let i = 0; i < 100; i++) {
    const id = randomUUID()
    const sentAt = performance.now()
    await call(c, c.codriver, "POST", `/api/drives/${driveId}/marks`, {
      marks: [{ id, t: driven[i * 10]!.t, kind: "note", text: `Bench mark ${i}` }],
    })
    await until(() => arrived.has(id))
    seconds.push((arrived.get(id)! - sentAt) / 1000)
  }
  abort.abort()
  return percentileOf(seconds, 95)
})

export const recordingDriveGetMs36k = benchFigure("recordingDriveGetMs36k", atMost(20, "ms"), APP_ENV, async (ctx) => {
  const c = await crew(ctx)
  const { file } = hourAt10Hz(ctx)
  const driveId = randomUUID()
  await call(c, c.driver, "POST", "/api/drives", { id: driveId, vehicleDescription: "Bench recording drive" })
  for (let i = 0, n = 0; i < file.samples.length; i += SEND_MAX_SAMPLES, n++) {
    await call(c, c.driver, "POST", `/api/drives/${driveId}/samples`, {
      batchId: `g${n}`,
      samples: file.samples.slice(i, i + SEND_MAX_SAMPLES),
    })
  }
  await call(c, c.driver, "POST", `/api/drives/${driveId}/marks`, {
    marks: file.marks.map((m) => ({ ...m, id: randomUUID() })),
  })
  const first = await call(c, c.driver, "GET", `/api/drives/${driveId}`)
  if (
    first.drive.status !== "recording" ||
    first.score.samplesUsed + first.score.samplesDropped !== file.samples.length
  )
    throw new Error("recording drive bench: unexpected drive")
  const times: number[] = []
  const floor: number[] = []
  for (let i = 0; i < 40; i++) {
    const t0 = performance.now()
    await call(c, c.driver, "GET", `/api/drives/${driveId}`)
    times.push(performance.now() - t0)
    // For context on a busy machine: the same session's "who am I" (the session check alone), interleaved.
    const t1 = performance.now()
    await call(c, c.driver, "GET", "/api/session")
    floor.push(performance.now() - t1)
  }
  console.error(
    `recordingDriveGetMs36k: for context, GET /api/session p50 ${percentileOf(floor, 50).toFixed(1)} ms in the same run`,
  )
  await c.cleanup()
  return percentileOf(times, 50)
})
