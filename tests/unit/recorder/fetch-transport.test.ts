// The recorder's real fetch transport against HTTP answers served by msw (no app server): what a phone meets
// on the way, a proxy's HTML 502, a signed-out 401, a refusal in the API's error shape, a dropped connection.
import { http, HttpResponse } from "msw"
import { setupServer } from "msw/node"
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest"
import { flushOutbox, makeItem, memoryOutboxStore } from "@/lib/recorder/outbox"
import { fetchTransport } from "@/lib/recorder/recorder"

const ORIGIN = "http://phone.test"
const DRIVE = "0b9a7c3e-52d1-4f0e-9a6b-7d2c1e4f5a6b"
const samples = (from: number, n: number) =>
  Array.from({ length: n }, (_, i) => ({ t: from + i * 100, lat: 41.6, lon: -93.6 + i * 1e-5, speed: 20, accuracy: 5 }))

const server = setupServer()
// The transport sends same-origin relative paths, as in the browser; msw resolves them against location.
const hadLocation = "location" in globalThis
beforeAll(() => {
  if (!hadLocation)
    Object.defineProperty(globalThis, "location", { value: new URL(`${ORIGIN}/record`), configurable: true })
  server.listen({ onUnhandledRequest: "error" })
})
afterEach(() => server.resetHandlers())
afterAll(() => {
  server.close()
  if (!hadLocation) Reflect.deleteProperty(globalThis, "location")
})

describe("fetchTransport with flushOutbox", () => {
  it("posts JSON (its batch id also in x-batch-id) to the drive's samples path and clears the outbox on 200", async () => {
    const seen: Array<{ type: string | null; header: string | null; batchId: string; count: number }> = []
    server.use(
      http.post(`${ORIGIN}/api/drives/:driveId/samples`, async ({ request, params }) => {
        expect(params.driveId).toBe(DRIVE)
        const body = (await request.json()) as { batchId: string; samples: unknown[] }
        seen.push({
          type: request.headers.get("content-type"),
          header: request.headers.get("x-batch-id"),
          batchId: body.batchId,
          count: body.samples.length,
        })
        return HttpResponse.json({ accepted: body.samples.length })
      }),
    )
    const store = memoryOutboxStore([makeItem(DRIVE, { type: "samples", batchId: "b1", samples: samples(0, 10) }, 1)])
    expect(await flushOutbox(store, fetchTransport)).toEqual({ kind: "done", sent: 1 })
    // The id in the header too, so that the server can answer a replay before reading the body.
    expect(seen).toEqual([{ type: "application/json", header: "b1", batchId: "b1", count: 10 }])
    expect(store.items.size).toBe(0)
  })

  it("keeps the batch and retries later when a proxy answers 502 with an HTML page", async () => {
    server.use(
      http.post(
        `${ORIGIN}/api/drives/:driveId/samples`,
        () => new HttpResponse("<html>Bad gateway</html>", { status: 502, headers: { "content-type": "text/html" } }),
      ),
    )
    const store = memoryOutboxStore([makeItem(DRIVE, { type: "samples", batchId: "b2", samples: samples(0, 5) }, 1)])
    const out = await flushOutbox(store, fetchTransport, { nowMs: () => 5_000, random: () => 0.5 })
    expect(out.kind).toBe("offline")
    const [kept] = [...store.items.values()]
    expect(kept?.attempts).toBe(1)
    expect(kept?.failed).toBeUndefined()
  })

  it("treats a dropped connection like no network: nothing lost", async () => {
    server.use(http.post(`${ORIGIN}/api/drives/:driveId/samples`, () => HttpResponse.error()))
    const store = memoryOutboxStore([makeItem(DRIVE, { type: "samples", batchId: "b3", samples: samples(0, 5) }, 1)])
    expect((await flushOutbox(store, fetchTransport, { nowMs: () => 5_000 })).kind).toBe("offline")
    expect(store.items.size).toBe(1)
  })

  it("stops on 401 and keeps everything for after sign-in", async () => {
    server.use(
      http.post(`${ORIGIN}/api/drives/:driveId/samples`, () =>
        HttpResponse.json({ error: { code: "unauthenticated", message: "Sign in" } }, { status: 401 }),
      ),
    )
    const store = memoryOutboxStore([makeItem(DRIVE, { type: "samples", batchId: "b4", samples: samples(0, 5) }, 1)])
    expect(await flushOutbox(store, fetchTransport)).toEqual({ kind: "signed-out", sent: 0 })
    expect([...store.items.values()][0]?.failed).toBeUndefined()
  })

  it("keeps a refused batch with the server's code and message and sends the next one", async () => {
    server.use(
      http.post(`${ORIGIN}/api/drives/:driveId/samples`, async ({ request }) => {
        const body = (await request.json()) as { batchId: string }
        if (body.batchId === "bad")
          return HttpResponse.json(
            { error: { code: "invalid_body", message: "samples.0.lat: too big" } },
            { status: 422 },
          )
        return HttpResponse.json({ accepted: 1 })
      }),
    )
    // Two pieces of different drives are never joined, so each is answered on its own.
    const other = "5d4c3b2a-1f0e-4d9c-8b7a-6f5e4d3c2b1a"
    const store = memoryOutboxStore([
      makeItem(DRIVE, { type: "samples", batchId: "bad", samples: samples(0, 1) }, 1),
      makeItem(other, { type: "samples", batchId: "good", samples: samples(0, 1) }, 2),
    ])
    expect(await flushOutbox(store, fetchTransport)).toEqual({ kind: "done", sent: 1 })
    const [kept] = [...store.items.values()]
    expect(kept?.failed).toEqual({ status: 422, code: "invalid_body", message: "samples.0.lat: too big" })
  })
})
