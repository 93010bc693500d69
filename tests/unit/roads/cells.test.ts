import { cellToBoundary, cellToLatLng, gridDisk, latLngToCell } from "h3-js"
import { describe, expect, it } from "vitest"
import { ROAD_RESOLUTION, cellCentre, cellCorners, createCellLocator } from "@/lib/roads"
import { generateDrive } from "@/lib/tracks"
import { DEMO_ROAD_LAYOUTS, generateRoadDrive } from "@/lib/tracks/roads"

// Published examples: uber/h3-js, test/h3core.spec.js (tests "latLngToCell", "cellToLatLng",
// "cellToBoundary" and "gridDisk").
describe("cell indexing against the h3-js test suite", () => {
  it("puts 37.3615593, -122.0553238 in cell 85283473fffffff at resolution 5", () => {
    // uber/h3-js test/h3core.spec.js, test "latLngToCell"
    expect(createCellLocator(5)(37.3615593, -122.0553238)).toBe("85283473fffffff")
    // same test: "Properly handle 8 Fs"
    expect(createCellLocator(5)(30.943387, -164.991559)).toBe("8547732ffffffff")
  })

  it("gives the centre and corners of 85283473fffffff", () => {
    // uber/h3-js test/h3core.spec.js, tests "cellToLatLng" and "cellToBoundary"
    const [lat, lon] = cellCentre("85283473fffffff")
    expect(lat).toBeCloseTo(37.34579337536848, 10)
    expect(lon).toBeCloseTo(-121.97637597255124, 10)
    const corners = cellCorners("85283473fffffff")
    const expected = [
      [37.271355866731895, -121.91508032705622],
      [37.353926450852256, -121.86222328902491],
      [37.42834118609435, -121.9235499963016],
      [37.42012867767778, -122.0377349642703],
      [37.33755608435298, -122.09042892904395],
      [37.26319797461824, -122.02910130919],
    ]
    expect(corners).toHaveLength(6)
    corners.forEach(([a, b], i) => {
      expect(a).toBeCloseTo(expected[i]![0]!, 10)
      expect(b).toBeCloseTo(expected[i]![1]!, 10)
    })
  })

  it("finds each cell of the published res-9 disc around 8928308280fffff from its centre", () => {
    // uber/h3-js test/h3core.spec.js, test "gridDisk": the cell and its six neighbours
    const disc = [
      "8928308280fffff",
      "8928308280bffff",
      "89283082807ffff",
      "89283082877ffff",
      "89283082803ffff",
      "89283082873ffff",
      "8928308283bffff",
    ]
    expect(new Set(gridDisk("8928308280fffff", 1))).toEqual(new Set(disc))
    const locate = createCellLocator(ROAD_RESOLUTION)
    for (const cell of disc) {
      const [lat, lon] = cellToLatLng(cell)
      expect(locate(lat, lon)).toBe(cell)
    }
  })

  it("answers exactly as latLngToCell for every sample of generated tracks, near cell edges too", () => {
    const files = [
      generateDrive({ seed: 11, minutes: 20, hz: 5 }),
      ...DEMO_ROAD_LAYOUTS.map((layout, i) =>
        generateRoadDrive({
          layout,
          seed: 30 + i,
          startMs: Date.UTC(2026, 5, 1, 15),
          home: { lat: 43.87, lon: -91.92 },
        }),
      ),
    ]
    let checked = 0
    for (const file of files) {
      const locate = createCellLocator()
      for (const s of file.samples) {
        expect(locate(s.lat, s.lon)).toBe(latLngToCell(s.lat, s.lon, ROAD_RESOLUTION))
        checked++
      }
    }
    // points on the corners of a cell (the hardest case for the inscribed-disc shortcut)
    const locate = createCellLocator()
    for (const [a, b] of cellToBoundary("8928308280fffff")) {
      for (const f of [0.999, 1.001]) {
        const [clat, clon] = cellToLatLng("8928308280fffff")
        const lat = clat + (a - clat) * f
        const lon = clon + (b - clon) * f
        expect(locate(clat, clon)).toBe("8928308280fffff")
        expect(locate(lat, lon)).toBe(latLngToCell(lat, lon, ROAD_RESOLUTION))
      }
    }
    expect(checked).toBeGreaterThan(5000)
  })
})
