import fc from "fast-check"
import { describe, expect, it } from "vitest"
import { isQuarterTurn, THUMBNAIL_MAX_PX, thumbnailKeyFor, thumbnailSize } from "@/lib/thumbnail"

describe("thumbnailSize", () => {
  it("scales a 3:2 landscape photo to 320 on the long side", () => {
    // 3000 x 2000 -> 320 x 213.33, rounded to 213 (arithmetic, no source needed)
    expect(thumbnailSize(3000, 2000)).toEqual({ widthPx: 320, heightPx: 213 })
    expect(thumbnailSize(4032, 3024)).toEqual({ widthPx: 320, heightPx: 240 })
  })

  // EXIF 2.32 (CIPA DC-008), tag 0x0112 Orientation: values 5-8 have the 0th row on the visual left or right side,
  // i.e. the picture is stored turned a quarter turn; 1-4 are upright, mirrored or upside down.
  it("trades width and height for EXIF orientations 5 to 8 only", () => {
    for (const o of [5, 6, 7, 8]) expect(thumbnailSize(3000, 2000, o)).toEqual({ widthPx: 213, heightPx: 320 })
    for (const o of [undefined, 1, 2, 3, 4])
      expect(thumbnailSize(3000, 2000, o)).toEqual({ widthPx: 320, heightPx: 213 })
    expect([1, 2, 3, 4, 5, 6, 7, 8].map(isQuarterTurn)).toEqual([false, false, false, false, true, true, true, true])
  })

  it("never enlarges a small photo and keeps at least 1 px on a side", () => {
    expect(thumbnailSize(32, 24)).toEqual({ widthPx: 32, heightPx: 24 })
    expect(thumbnailSize(320, 320)).toEqual({ widthPx: 320, heightPx: 320 })
    expect(thumbnailSize(10_000, 10)).toEqual({ widthPx: 320, heightPx: 1 })
  })

  it("takes another limit, such as a mid-size print variant", () => {
    expect(thumbnailSize(4000, 3000, 1, 1024)).toEqual({ widthPx: 1024, heightPx: 768 })
  })

  it("refuses sizes that are not positive whole pixels", () => {
    for (const [w, h] of [
      [0, 10],
      [10, -1],
      [1.5, 10],
      [Number.NaN, 10],
    ] as const) {
      expect(() => thumbnailSize(w, h)).toThrow(RangeError)
    }
  })

  it("keeps the long side within the limit and the aspect ratio within rounding, for any size", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 20_000 }),
        fc.integer({ min: 1, max: 20_000 }),
        fc.integer({ min: 1, max: 8 }),
        (w, h, o) => {
          const t = thumbnailSize(w, h, o)
          const [ow, oh] = o >= 5 ? [h, w] : [w, h]
          expect(Math.max(t.widthPx, t.heightPx)).toBeLessThanOrEqual(Math.min(THUMBNAIL_MAX_PX, Math.max(ow, oh)))
          expect(t.widthPx).toBeLessThanOrEqual(ow)
          expect(t.heightPx).toBeLessThanOrEqual(oh)
          // Rounding each side moves it by at most half a pixel (1 px when clamped up to 1).
          const scale = Math.min(1, THUMBNAIL_MAX_PX / Math.max(ow, oh))
          expect(Math.abs(t.widthPx - ow * scale)).toBeLessThanOrEqual(1)
          expect(Math.abs(t.heightPx - oh * scale)).toBeLessThanOrEqual(1)
        },
      ),
    )
  })
})

describe("thumbnailKeyFor", () => {
  it("puts the thumbnail beside the original under the same prefix", () => {
    expect(thumbnailKeyFor("shops/s/jobs/j/a")).toBe("shops/s/jobs/j/a.thumb.jpg")
  })
})
