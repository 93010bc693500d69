import { describe, expect, it } from "vitest"
import { MARK_MARGIN_MS, marksOutsideDrive, markWindow } from "@/lib/access/mark-window"

// The 2-minute margin is this product's rule (issue: "a sealed drive"), not a published value.
const T0 = Date.UTC(2026, 5, 1, 9)
const span = { firstSampleT: T0, lastSampleT: T0 + 31 * 60_000, finishedAtMs: T0 + 31 * 60_000 + 5_000 }

describe("the window a mark must fall in", () => {
  it("runs from 2 min before the first position to 2 min after the later of Finish and the last position", () => {
    expect(markWindow(span)).toEqual({ fromMs: T0 - MARK_MARGIN_MS, toMs: span.finishedAtMs + MARK_MARGIN_MS })
    expect(markWindow({ ...span, lastSampleT: span.finishedAtMs + 60_000 }).toMs).toBe(
      span.finishedAtMs + 60_000 + MARK_MARGIN_MS,
    )
  })

  it("has no end while recording and no start before any position", () => {
    expect(markWindow({ firstSampleT: null, lastSampleT: null, finishedAtMs: null })).toEqual({
      fromMs: null,
      toMs: null,
    })
    expect(
      marksOutsideDrive([{ t: 0 }, { t: 9e15 }], { firstSampleT: null, lastSampleT: null, finishedAtMs: null }),
    ).toEqual({})
  })

  it("names each mark outside by its path and keeps the ones inside, edges included", () => {
    const fields = marksOutsideDrive(
      [
        { t: T0 - MARK_MARGIN_MS },
        { t: T0 - MARK_MARGIN_MS - 1 },
        { t: span.finishedAtMs + MARK_MARGIN_MS },
        { t: span.finishedAtMs + 2 * 3_600_000 },
      ],
      span,
    )
    expect(Object.keys(fields)).toEqual(["marks.1.t", "marks.3.t"])
    expect(fields["marks.3.t"]).toMatch(/^is 120 min after the drive finished/)
  })
})
