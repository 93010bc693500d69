import { afterEach, beforeEach, describe, expect, it, vi } from "vitest"
import { connectLive, type LiveHandlers } from "@/lib/recorder/live-client"

/** A stand-in for the browser's EventSource: the test fires its events and errors. */
class FakeSource {
  static made: FakeSource[] = []
  readyState = 0
  onerror: (() => void) | null = null
  closed = false
  private listeners = new Map<string, Array<(e: unknown) => void>>()
  constructor(readonly url: string) {
    FakeSource.made.push(this)
  }
  addEventListener(kind: string, fn: (e: unknown) => void) {
    this.listeners.set(kind, [...(this.listeners.get(kind) ?? []), fn])
  }
  emit(kind: string, data: unknown, id = "") {
    this.readyState = 1
    for (const fn of this.listeners.get(kind) ?? []) fn({ data: JSON.stringify(data), lastEventId: id })
  }
  fail(closed: boolean) {
    this.readyState = closed ? 2 : 0
    this.onerror?.()
  }
  close() {
    this.closed = true
    this.readyState = 2
  }
}

function handlers() {
  const seen: string[] = []
  const h: LiveHandlers = {
    snapshot: (s) => seen.push(`snapshot:${s.marks.length}`),
    mark: (m) => seen.push(`mark:${m.id}`),
    unmark: (id) => seen.push(`unmark:${id}`),
    status: (s) => seen.push(`status:${s.status}`),
    score: () => seen.push("score"),
    connection: (state) => seen.push(`connection:${state}`),
  }
  return { h, seen }
}

const ES = FakeSource as unknown as typeof EventSource

describe("the live client", () => {
  beforeEach(() => {
    FakeSource.made = []
    vi.useFakeTimers()
  })
  afterEach(() => vi.useRealTimers())

  it("opens the stream, hands on events, and reopens from the last event id", () => {
    const { h, seen } = handlers()
    const link = connectLive("d1", h, { EventSourceImpl: ES, fetchImpl: vi.fn() })
    const first = FakeSource.made[0]!
    expect(first.url).toBe("/api/drives/d1/live")
    first.emit("snapshot", { lastEventId: 4, drive: {}, marks: [{ id: "a" }], score: {} }, "4")
    first.emit("mark", { id: "b", t: 1, kind: "cleared" }, "7")
    expect(seen).toContain("snapshot:1")
    expect(seen).toContain("mark:b")
    expect(seen).toContain("connection:live")
    expect(link.lastEventId).toBe(7)
    link.reconnect()
    expect(first.closed).toBe(true)
    expect(FakeSource.made[1]!.url).toBe("/api/drives/d1/live?lastEventId=7")
    link.close()
  })

  it("polls with ?after= when the stream is refused, and says offline when nothing answers", async () => {
    const { h, seen } = handlers()
    const fetchImpl = vi
      .fn()
      .mockRejectedValueOnce(new TypeError("network"))
      .mockImplementation(
        async () =>
          new Response(
            JSON.stringify({
              lastEventId: 9,
              events: [{ id: 9, kind: "unmark", body: { id: "x" } }],
              status: { status: "finished" },
              score: {},
            }),
            {
              headers: { "content-type": "application/json" },
            },
          ),
      )
    const link = connectLive("d2", h, { EventSourceImpl: null, fetchImpl, pollMs: 1000 })
    await vi.waitFor(() => expect(seen).toContain("connection:offline"))
    expect(fetchImpl.mock.calls[0]![0]).toBe("/api/drives/d2/live?after=0")
    await vi.advanceTimersByTimeAsync(1000)
    await vi.waitFor(() => expect(seen).toContain("unmark:x"))
    expect(seen).toContain("status:finished")
    expect(seen).toContain("connection:polling")
    expect(link.lastEventId).toBe(9)
    await vi.advanceTimersByTimeAsync(1000)
    expect(fetchImpl.mock.calls.at(-1)![0]).toBe("/api/drives/d2/live?after=9")
    link.close()
  })

  it("falls back to polling when the stream closes with an error", async () => {
    const { h } = handlers()
    const fetchImpl = vi.fn().mockImplementation(async () => new Response("{}", { status: 404 }))
    const link = connectLive("d3", h, { EventSourceImpl: ES, fetchImpl })
    FakeSource.made[0]!.fail(true)
    await vi.waitFor(() => expect(fetchImpl).toHaveBeenCalledWith("/api/drives/d3/live?after=0", expect.anything()))
    link.close()
  })

  it("lets go of the stream when the network goes away, and asks again only once the browser is back online", async () => {
    const { h, seen } = handlers()
    const onLine = { onLine: true }
    vi.stubGlobal("navigator", onLine)
    try {
      const fetchImpl = vi.fn().mockImplementation(
        async () =>
          new Response(JSON.stringify({ lastEventId: 3, events: [], status: { status: "recording" }, score: {} }), {
            headers: { "content-type": "application/json" },
          }),
      )
      const link = connectLive("d4", h, { EventSourceImpl: ES, fetchImpl, pollMs: 1000 })
      const first = FakeSource.made[0]!
      first.emit("heartbeat", { at: 1 }, "2")
      expect(seen.at(-1)).toBe("connection:live")

      onLine.onLine = false
      link.offline()
      expect(first.closed).toBe(true)
      expect(seen.at(-1)).toBe("connection:offline")
      // An event the old stream still hands on (already on its way) does not make the phone say it is live.
      first.emit("score", {}, "3")
      expect(seen.at(-1)).toBe("connection:offline")
      expect(seen.filter((s) => s === "score")).toHaveLength(0)
      // While the browser says offline, a minute of polls asks nothing.
      await vi.advanceTimersByTimeAsync(60_000)
      expect(fetchImpl).not.toHaveBeenCalled()
      expect(FakeSource.made).toHaveLength(1)
      expect(seen.at(-1)).toBe("connection:offline")

      // Back online without the online event reaching the page: the next poll finds the server and reopens the stream.
      onLine.onLine = true
      await vi.advanceTimersByTimeAsync(1000)
      await vi.waitFor(() => expect(seen).toContain("connection:polling"))
      expect(fetchImpl.mock.calls[0]![0]).toBe("/api/drives/d4/live?after=2")
      expect(FakeSource.made).toHaveLength(2)
      expect(FakeSource.made[1]!.url).toBe("/api/drives/d4/live?lastEventId=3")
      link.close()
    } finally {
      vi.unstubAllGlobals()
    }
  })

  it("opens one stream, not two, when the online event comes while a poll waits", async () => {
    const { h } = handlers()
    vi.stubGlobal("navigator", { onLine: false })
    try {
      const fetchImpl = vi.fn()
      const link = connectLive("d5", h, { EventSourceImpl: ES, fetchImpl, pollMs: 1000 })
      link.offline()
      vi.stubGlobal("navigator", { onLine: true })
      link.reconnect()
      expect(FakeSource.made).toHaveLength(2)
      await vi.advanceTimersByTimeAsync(5000)
      expect(fetchImpl).not.toHaveBeenCalled()
      expect(FakeSource.made).toHaveLength(2)
      link.close()
    } finally {
      vi.unstubAllGlobals()
    }
  })
})
