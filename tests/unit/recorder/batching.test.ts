import fc from "fast-check"
import { describe, expect, it } from "vitest"
import * as batching from "@/lib/recorder/batching"

describe("shouldPersist", () => {
  it("writes once the oldest buffered sample is a second old, or the buffer is full", () => {
    expect(batching.shouldPersist(0, null, 10_000)).toBe(false)
    expect(batching.shouldPersist(3, 10_000, 10_000 + batching.PERSIST_EVERY_MS - 1)).toBe(false)
    expect(batching.shouldPersist(3, 10_000, 10_000 + batching.PERSIST_EVERY_MS)).toBe(true)
    expect(batching.shouldPersist(batching.PERSIST_MAX_SAMPLES, 10_000, 10_000)).toBe(true)
  })
})

describe("shouldSend", () => {
  it("sends every 5 s or 50 samples, whichever comes first, and never with nothing waiting", () => {
    expect(batching.SEND_EVERY_MS).toBe(5000)
    expect(batching.SEND_AT_SAMPLES).toBe(50)
    expect(batching.shouldSend(0, null, 99_000)).toBe(false)
    expect(batching.shouldSend(0, 10_000, 99_000)).toBe(false)
    expect(batching.shouldSend(49, 10_000, 10_000 + batching.SEND_EVERY_MS - 1)).toBe(false)
    expect(batching.shouldSend(1, 10_000, 10_000 + batching.SEND_EVERY_MS)).toBe(true)
    expect(batching.shouldSend(50, 10_000, 10_000)).toBe(true)
  })
  it("at 10 Hz a POST carries 50 samples; at 1 Hz 6 (five seconds of them)", () => {
    const perPost = (hz: number) => {
      let unsent = 0
      let since: number | null = null
      for (let ms = 0; ; ms += 1000 / hz) {
        since ??= ms
        unsent += 1
        if (batching.shouldSend(unsent, since, ms)) return unsent
      }
    }
    expect(perPost(10)).toBe(50)
    expect(perPost(1)).toBe(6)
  })
})

describe("groupForSending", () => {
  const item = (key: string | null, size: number, id: string) => ({ key, size, id })
  it("joins neighbours of one kind up to the limit and keeps order", () => {
    const items = [item("s", 5, "a"), item("s", 5, "b"), item("s", 5, "c"), item("m", 1, "d"), item("s", 2, "e")]
    const groups = batching.groupForSending(
      items,
      (i) => i.key,
      (i) => i.size,
      10,
    )
    expect(groups.map((g) => g.items.map((i) => i.id))).toEqual([["a", "b"], ["c"], ["d"], ["e"]])
  })

  it("never splits, never drops and never reorders an item", () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ key: fc.constantFrom("s", "m", null), size: fc.integer({ min: 1, max: 30 }) }), {
          maxLength: 60,
        }),
        fc.integer({ min: 1, max: 50 }),
        (raw, max) => {
          const items = raw.map((r, i) => ({ ...r, id: String(i) }))
          const groups = batching.groupForSending(
            items,
            (i) => i.key,
            (i) => i.size,
            max,
          )
          const flat = groups.flatMap((g) => g.items.map((i) => i.id))
          return (
            flat.join() === items.map((i) => i.id).join() &&
            groups.every(
              (g) =>
                g.items.length === 1 ||
                (g.size <= max && new Set(g.items.map((i) => i.key)).size === 1 && g.items[0]!.key !== null),
            )
          )
        },
      ),
    )
  })
})

describe("groupBatchId", () => {
  it("keeps a single piece's id and names a group by its ends and size", () => {
    expect(batching.groupBatchId(["only"])).toBe("only")
    const a = batching.groupBatchId(["11111111-aaaa", "22222222-bbbb", "33333333-cccc"])
    expect(a).toBe("11111111-aaaa~33333333~3")
    expect(batching.groupBatchId(["11111111-aaaa", "22222222-bbbb"])).not.toBe(a)
  })
})
