// The streamed exports (lib/export/stream.ts) must write exactly what the whole-file functions write: toGpx, toCsv
// and JSON.stringify. The samples arrive as the database cursor hands them over: by time, unique times, in chunks.
import { describe, expect, it } from "vitest"
import type { AnyDriveFile, Sample } from "@/lib/drive-file/schema"
import { resolveProfile } from "@/lib/drive-file/profile"
import { toCsv, toGpx } from "@/lib/export"
import { csvChunks, driveFileChunks, gpxChunks, type Around, type GpxLookahead } from "@/lib/export/stream"
import { generateDrive } from "@/lib/tracks"
import { drive, mark, steady } from "../helpers/drive"
import { check, metRoadTest } from "../helpers/road-test"

async function* chunked(samples: readonly Sample[], size: number) {
  for (let i = 0; i < samples.length; i += size) yield samples.slice(i, i + size)
}

async function collect(chunks: AsyncIterable<string>) {
  let s = ""
  for await (const c of chunks) s += c
  return s
}

/** What db/queries/drive-export.ts asks the database for, worked out here from the whole file by a plain scan. */
function lookaheadOf(file: AnyDriveFile): GpxLookahead {
  const { maxAccuracyM } = resolveProfile(file.profile)
  const kept = file.samples.filter((s) => s.accuracy == null || s.accuracy <= maxAccuracyM)
  const around = new Map<number, Around>()
  for (const m of file.marks) {
    const before = kept.filter((s) => s.t <= m.t).at(-1)
    const after = kept.find((s) => s.t > m.t)
    around.set(m.t, { ...(before ? { before } : {}), ...(after ? { after } : {}) })
  }
  return { firstKeptT: kept[0]?.t, around }
}

/** The cursor's order: by time, one sample per time. */
function asStored(file: AnyDriveFile): AnyDriveFile {
  const seen = new Set<number>()
  const samples = [...file.samples].sort((a, b) => a.t - b.t).filter((s) => !seen.has(s.t) && seen.add(s.t))
  return { ...file, samples }
}

const META = { name: 'Invented drive <A&B> "quoted"', creator: "Straightaway" }

function cases(): [string, AnyDriveFile][] {
  const gaps = generateDrive({ seed: 7, minutes: 18, pattern: "met", dataGaps: 2, speedMissingShare: 0.1 })
  // Some samples beyond the accuracy limit (30 m by default), two of them where marks fall.
  const noisy = {
    ...gaps,
    samples: gaps.samples.map((s, i) =>
      i % 37 === 0 || i === 0 || i === gaps.samples.length - 1 ? { ...s, accuracy: 55 } : s,
    ),
  }
  const edges = drive(steady(40, 20), [
    mark(-5, "lead-on", { gapFt: 140 }), // before the first sample
    mark(0, "gap", { gapFt: 120 }), // at the first sample
    mark(12.5, "note", { text: "between <two> & 'samples', \u0007 bell" }),
    mark(12.5, "note", { text: "same moment" }),
    mark(40, "lead-off"), // at the last sample
    mark(99, "stopped"), // after it
  ])
  const allDropped = drive(
    steady(5, 20).map((s) => ({ ...s, accuracy: 80 })),
    [mark(2, "lead-on", { gapFt: 130 })],
  )
  const road = asStored({ ...metRoadTest(), marks: [...metRoadTest().marks, check(45, "sign-display", "fail")] })
  return [
    ["a generated drive with data gaps and missing speeds", asStored(gaps)],
    ["inaccurate samples, marks on them", asStored(noisy)],
    ["marks before, at and after the samples, notes to escape", asStored(edges)],
    ["no kept sample at all", asStored(allDropped)],
    ["no samples", drive([], [mark(1, "note", { text: "nothing recorded" })])],
    ["a road test (format 2)", road],
  ]
}

describe("streamed exports write what the whole-file functions write", () => {
  for (const [name, file] of cases()) {
    for (const size of [1, 7, 5000]) {
      it(`${name}, chunks of ${size}`, async () => {
        const head = { ...file, samples: [] }
        expect(await collect(gpxChunks(head, lookaheadOf(file), chunked(file.samples, size), META))).toBe(
          toGpx(file, META),
        )
        expect(await collect(csvChunks(head, chunked(file.samples, size)))).toBe(toCsv(file))
        expect(await collect(driveFileChunks(head, chunked(file.samples, size)))).toBe(JSON.stringify(file))
      })
    }
  }

  it("a mark's waypoint sits between the samples around it (the check above could not pass with it left out)", async () => {
    const file = drive(steady(10, 20), [mark(4.5, "note", { text: "half way" })])
    const gpx = await collect(gpxChunks({ ...file, samples: [] }, lookaheadOf(file), chunked(file.samples, 3), META))
    const lat = Number(/<wpt lat="([^"]+)"/.exec(gpx)![1])
    expect(lat).toBeGreaterThan(file.samples[4]!.lat)
    expect(lat).toBeLessThan(file.samples[5]!.lat)
  })
})
