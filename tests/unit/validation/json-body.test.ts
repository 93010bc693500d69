import { describe, expect, it } from "vitest"
import { BodyTooLargeError, jsonNestsDeeperThan, MAX_JSON_DEPTH, readBodyText } from "@/lib/validation/json-body"
import { findUnstorableText } from "@/lib/validation/storable"

function streamOf(chunks: string[]) {
  let pulled = 0
  let cancelled = false
  const stream = new ReadableStream<Uint8Array>(
    {
      pull(controller) {
        if (pulled < chunks.length) controller.enqueue(new TextEncoder().encode(chunks[pulled++]))
        else controller.close()
      },
      cancel() {
        cancelled = true
      },
    },
    { highWaterMark: 0 },
  )
  return { stream, pulled: () => pulled, cancelled: () => cancelled }
}

describe("readBodyText", () => {
  it("reads a body in chunks, multi-byte characters split across them included", async () => {
    const bytes = new TextEncoder().encode('{"name":"résumé 🚗"}')
    const a = new TextDecoder().decode(bytes.subarray(0, 12))
    expect(a).not.toBe("") // the split falls inside "é"
    const stream = new ReadableStream<Uint8Array>({
      start(c) {
        c.enqueue(bytes.subarray(0, 12))
        c.enqueue(bytes.subarray(12))
        c.close()
      },
    })
    expect(await readBodyText(stream, 1000)).toBe('{"name":"résumé 🚗"}')
  })

  it("stops at the first chunk past the limit and cancels the stream, with no Content-Length", async () => {
    const s = streamOf(Array.from({ length: 100 }, () => "x".repeat(1000)))
    await expect(readBodyText(s.stream, 5_500)).rejects.toBeInstanceOf(BodyTooLargeError)
    expect(s.pulled()).toBeLessThan(10)
    expect(s.cancelled()).toBe(true)
  })

  it("refuses a declared Content-Length over the limit before reading", async () => {
    const s = streamOf(["{}"])
    await expect(readBodyText(s.stream, 10, 11)).rejects.toBeInstanceOf(BodyTooLargeError)
    expect(s.pulled()).toBe(0)
  })

  it("a missing body is empty text", async () => {
    expect(await readBodyText(null, 10)).toBe("")
  })
})

describe("jsonNestsDeeperThan", () => {
  it("counts arrays and objects, not brackets inside strings", () => {
    expect(jsonNestsDeeperThan('{"a":[{"b":[1]}]}', 4)).toBe(false)
    expect(jsonNestsDeeperThan('{"a":[{"b":[[1]]}]}', 4)).toBe(true)
    expect(jsonNestsDeeperThan(JSON.stringify({ text: "[[[[[[[[[[{{{{{{" }), 1)).toBe(false)
    expect(jsonNestsDeeperThan(JSON.stringify({ text: 'quote \\" then [[[[' }), 1)).toBe(false)
  })

  it("finds 100,000 nested arrays too deep", () => {
    const text = "[".repeat(100_000) + "]".repeat(100_000)
    expect(jsonNestsDeeperThan(text, MAX_JSON_DEPTH)).toBe(true)
    expect(jsonNestsDeeperThan("[".repeat(MAX_JSON_DEPTH) + "]".repeat(MAX_JSON_DEPTH), MAX_JSON_DEPTH)).toBe(false)
  })
})

describe("findUnstorableText", () => {
  it("names the path of the string refused", () => {
    expect(findUnstorableText({ marks: [{ text: "ok" }, { text: "bad\u0000" }] })).toEqual({
      path: "marks.1.text",
      problem: "must not contain the NUL character",
    })
    expect(findUnstorableText({ a: { ["k\ud800"]: 1 } })?.path).toBe("a.(key)")
    expect(findUnstorableText("\ud800")?.path).toBe("(body)")
    expect(findUnstorableText({ a: [1, "fine", { b: null }] })).toBeNull()
  })

  it("walks 100,000 levels of nesting and still names the deepest path", () => {
    let deep: unknown = "bad\u0000"
    for (let i = 0; i < 100_000; i++) deep = [deep]
    const found = findUnstorableText(deep)
    expect(found?.path.split(".").length).toBe(100_000)
    let clean: unknown = "fine"
    for (let i = 0; i < 100_000; i++) clean = [clean]
    expect(findUnstorableText(clean)).toBeNull()
  })
})
