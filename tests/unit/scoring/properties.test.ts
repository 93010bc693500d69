import fc from "fast-check"
import { describe, expect, it } from "vitest"
import type { Score } from "@/lib/scoring"
import { createLiveScorer, scoreDrive } from "@/lib/scoring"
import { arbDrive, permute } from "../helpers/arbitraries"

const keys = fc.array(fc.integer({ min: 0, max: 1000 }), { minLength: 1, maxLength: 60 })

function withoutCounters(s: Score) {
  const { samplesDropped: _a, duplicateSamples: _b, samplesDroppedForAccuracy: _c, ...rest } = s
  return rest
}

describe("scoring properties (fast-check)", () => {
  it("does not change when samples or marks are reordered", () => {
    fc.assert(
      fc.property(arbDrive, keys, keys, (file, k1, k2) => {
        const shuffled = { ...file, samples: permute(file.samples, k1), marks: permute(file.marks, k2) }
        expect(scoreDrive(shuffled)).toEqual(scoreDrive(file))
      }),
      { numRuns: 200 },
    )
  })

  it("does not change when exact duplicate samples are added, apart from the drop count", () => {
    fc.assert(
      fc.property(arbDrive, fc.array(fc.nat(), { maxLength: 20 }), keys, (file, picks, k) => {
        fc.pre(file.samples.length > 0)
        const dupes = picks.map((p) => ({ ...file.samples[p % file.samples.length]! }))
        const withDupes = { ...file, samples: permute([...file.samples, ...dupes], k) }
        const before = scoreDrive(file)
        const after = scoreDrive(withDupes)
        expect(withoutCounters(after)).toEqual(withoutCounters(before))
        expect(after.samplesDropped).toBe(before.samplesDropped + dupes.length)
      }),
      { numRuns: 200 },
    )
  })

  it("keeps following <= qualifying <= duration - gaps, and before-clear <= total", () => {
    fc.assert(
      fc.property(arbDrive, (file) => {
        const s = scoreDrive(file)
        const eps = 0.002 // fields are rounded to the millisecond
        expect(s.followingSeconds).toBeLessThanOrEqual(s.qualifyingSeconds + eps)
        expect(s.qualifyingSeconds).toBeLessThanOrEqual(s.durationSeconds - s.gapSeconds + eps)
        expect(s.qualifyingSecondsBeforeClear).toBeLessThanOrEqual(s.qualifyingSeconds + eps)
        expect(s.followingSecondsBeforeClear).toBeLessThanOrEqual(s.qualifyingSecondsBeforeClear + eps)
        expect(s.samplesUsed + s.samplesDropped).toBe(file.samples.length)
      }),
      { numRuns: 300 },
    )
  })

  it("gives the batch score from the live scorer for any batching and arrival order", () => {
    fc.assert(
      fc.property(
        arbDrive,
        keys,
        keys,
        fc.array(fc.integer({ min: 1, max: 15 }), { minLength: 1, maxLength: 10 }),
        fc.array(fc.boolean(), { minLength: 1, maxLength: 10 }),
        (file, k1, k2, sizes, sortedFirst) => {
          // Mostly in-order arrival (the common case) or shuffled, cut into batches.
          const samples = sortedFirst[0] ? file.samples : permute(file.samples, k1)
          const marks = sortedFirst[sortedFirst.length - 1] ? file.marks : permute(file.marks, k2)
          const live = createLiveScorer(file.profile)
          const seenSamples: typeof samples = []
          const seenMarks: typeof marks = []
          let si = 0
          let mi = 0
          let step = 0
          while (si < samples.length || mi < marks.length) {
            const size = sizes[step % sizes.length]!
            if (step % 2 === 0 || mi >= marks.length) {
              const batch = samples.slice(si, si + size)
              si += batch.length
              live.addSamples(batch)
              seenSamples.push(...batch)
            } else {
              const batch = marks.slice(mi, mi + Math.ceil(size / 3))
              mi += batch.length
              live.addMarks(batch)
              seenMarks.push(...batch)
            }
            step++
            // Every intermediate score equals the batch score over what has arrived.
            const expected = scoreDrive({ ...file, samples: seenSamples, marks: seenMarks })
            expect(live.score()).toEqual(expected)
          }
          expect(live.score()).toEqual(scoreDrive({ ...file, samples, marks }))
        },
      ),
      { numRuns: 300 },
    )
  })
})
