import { describe, expect, it } from "vitest"
import type { Sample } from "@/lib/drive-file"
import { SEND_MAX_SAMPLES } from "@/lib/recorder/batching"
import { flushOutbox, makeItem, memoryOutboxStore, type OutboxItem, type Transport } from "@/lib/recorder/outbox"

const DRIVE = "6f1c1a52-3d1e-4c55-9d4e-1a2b3c4d5e6f"

function samples(from: number, count: number): Sample[] {
  return Array.from({ length: count }, (_, i) => ({
    t: from + i * 100,
    lat: 41.6,
    lon: -93.6 + i * 1e-5,
    speed: 20,
    accuracy: 5,
  }))
}

/** A server that stores sample times once per batch id and per time, like the real one. */
function fakeServer(script: Array<number | "offline"> = []) {
  const times = new Set<number>()
  const batches = new Set<string>()
  const calls: Array<{ method: string; path: string; body: any }> = []
  const transport: Transport = {
    async request(method, path, body: any) {
      calls.push({ method, path, body })
      const next = script.shift()
      if (next === "offline") throw new TypeError("Failed to fetch")
      if (typeof next === "number" && next !== 200)
        return { status: next, body: { error: { code: "x", message: `status ${next}` } } }
      if (path.endsWith("/samples") && !batches.has(body.batchId)) {
        batches.add(body.batchId)
        for (const s of body.samples) times.add(s.t)
      }
      return { status: 200, body: {} }
    },
  }
  return { transport, times, calls }
}

describe("flushOutbox", () => {
  it("sends pieces oldest first, joined into bodies of at most SEND_MAX_SAMPLES, and empties the outbox", async () => {
    let now = 1000
    const items: OutboxItem[] = []
    for (let i = 0; i < 30; i++)
      items.push(makeItem(DRIVE, { type: "samples", batchId: `b${i}`, samples: samples(i * 10_000, 100) }, now++))
    const store = memoryOutboxStore(items)
    const server = fakeServer()
    const out = await flushOutbox(store, server.transport)
    expect(out).toEqual({ kind: "done", sent: 30 })
    expect(store.items.size).toBe(0)
    expect(server.times.size).toBe(3000)
    expect(server.calls.every((c) => c.body.samples.length <= SEND_MAX_SAMPLES)).toBe(true)
    expect(server.calls).toHaveLength(Math.ceil(3000 / SEND_MAX_SAMPLES))
  })

  it("stops at no network, keeps everything and schedules a retry with backoff", async () => {
    const store = memoryOutboxStore([makeItem(DRIVE, { type: "samples", batchId: "a", samples: samples(0, 5) }, 1)])
    const server = fakeServer(["offline"])
    const out = await flushOutbox(store, server.transport, { nowMs: () => 10_000, random: () => 0.5 })
    expect(out.kind).toBe("offline")
    const [kept] = [...store.items.values()]
    expect(kept!.attempts).toBe(1)
    expect(kept!.notBeforeMs).toBeGreaterThan(10_000)
    // Not due yet: nothing is sent.
    expect((await flushOutbox(store, server.transport, { nowMs: () => 10_001 })).kind).toBe("offline")
    expect(server.calls).toHaveLength(1)
    const later = await flushOutbox(store, server.transport, { nowMs: () => kept!.notBeforeMs })
    expect(later).toEqual({ kind: "done", sent: 1 })
  })

  it("retries a 5xx and keeps a 4xx for the crew to see, without holding up the rest", async () => {
    const store = memoryOutboxStore([
      makeItem(
        DRIVE,
        { type: "marks", marks: [{ id: "4b0f1e1c-3f5e-4e7a-9a1b-2c3d4e5f6a7b", t: 1, kind: "cleared" }] },
        1,
      ),
      makeItem(DRIVE, { type: "samples", batchId: "s", samples: samples(0, 3) }, 2),
    ])
    const server = fakeServer([503])
    expect((await flushOutbox(store, server.transport, { nowMs: () => 0 })).kind).toBe("offline")
    const refusing = fakeServer([400])
    const refused: OutboxItem[] = []
    const out = await flushOutbox(store, refusing.transport, { nowMs: () => 1e12, onRefused: (i) => refused.push(i) })
    expect(out).toEqual({ kind: "done", sent: 1 })
    expect(refused).toHaveLength(1)
    expect(refused[0]!.failed).toMatchObject({ status: 400, message: "status 400" })
    expect([...store.items.values()].map((i) => i.type)).toEqual(["marks"])
  })

  it("waits without counting attempts when the session has ended (401)", async () => {
    const store = memoryOutboxStore([makeItem(DRIVE, { type: "finish" }, 1)])
    const out = await flushOutbox(store, fakeServer([401]).transport)
    expect(out.kind).toBe("signed-out")
    expect([...store.items.values()][0]!.attempts).toBe(0)
  })

  it("stores every sample exactly once when answers are lost and the flush runs again", async () => {
    const items = Array.from({ length: 12 }, (_, i) =>
      makeItem(DRIVE, { type: "samples", batchId: `p${i}`, samples: samples(i * 1000, 10) }, i),
    )
    const store = memoryOutboxStore(items)
    const server = fakeServer()
    // The server stores the first body but the answer never arrives.
    const lossy: Transport = {
      async request(m, p, b) {
        await server.transport.request(m, p, b)
        if (server.calls.length === 1) throw new TypeError("connection reset")
        return { status: 200, body: {} }
      },
    }
    expect((await flushOutbox(store, lossy, { nowMs: () => 0 })).kind).toBe("offline")
    expect((await flushOutbox(store, lossy, { nowMs: () => 1e12 })).kind).toBe("done")
    expect(server.times.size).toBe(120)
    expect(server.calls[0]!.body.batchId).toBe(server.calls[1]!.body.batchId)
  })
})
