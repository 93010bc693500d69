// The hexagonal grid the road model is kept on: H3 (h3-js) at resolution 9. H3's table of cell
// statistics gives res 9 an average hexagon edge of about 0.17-0.20 km (edge = centre-to-corner), so a
// cell is about 300-350 m corner to corner: long enough to hold several seconds of driving at 50 mph (one
// sample a second lands 5-15 times in a cell), short enough that a stretch of road and its junctions fall
// in different cells. Res 8 (~0.46 km edge) blurs a divided road with the streets beside it; res 10
// (~0.066 km edge) leaves most cells with one or two samples of a passing drive.
import { cellToBoundary, cellToLatLng, cellToParent, latLngToCell } from "h3-js"

export const ROAD_RESOLUTION = 9
/** The coarser grid that decides which past drives took the same loop (see loops.ts). */
const LOOP_RESOLUTION = 8

const M_PER_DEG_LAT = 110_574

interface CellDisc {
  cell: string
  lat: number
  lon: number
  cosLat: number
  /** Square of a radius (m) inside which every point is in the cell, with a margin. */
  safeR2: number
}

/**
 * Finds the res-9 cell of each point of a track. A point inside the disc inscribed in the last cell is
 * in that cell, so most points of a drive (10+ in a row per cell at 1 Hz) skip the H3 look-up; the
 * answer is the same as latLngToCell for every point (checked against it in tests/unit/roads).
 */
export function createCellLocator(resolution = ROAD_RESOLUTION) {
  const discs = new Map<string, CellDisc>()
  let last: CellDisc | null = null
  const discOf = (cell: string): CellDisc => {
    let disc = discs.get(cell)
    if (!disc) {
      const [lat, lon] = cellToLatLng(cell)
      const cosLat = Math.cos((lat * Math.PI) / 180)
      const ring = cellToBoundary(cell).map(([a, b]) => [(b - lon) * cosLat * M_PER_DEG_LAT, (a - lat) * M_PER_DEG_LAT] as const)
      let inner = Infinity
      for (let i = 0; i < ring.length; i++) {
        const [x1, y1] = ring[i]!
        const [x2, y2] = ring[(i + 1) % ring.length]!
        // distance from the centre (0,0) to the line through the edge
        const d = Math.abs(x1 * y2 - x2 * y1) / Math.hypot(x2 - x1, y2 - y1)
        if (d < inner) inner = d
      }
      const safe = inner * 0.9
      disc = { cell, lat, lon, cosLat, safeR2: safe * safe }
      discs.set(cell, disc)
    }
    return disc
  }
  return (lat: number, lon: number): string => {
    if (last) {
      const dy = (lat - last.lat) * M_PER_DEG_LAT
      const dx = (lon - last.lon) * last.cosLat * M_PER_DEG_LAT
      if (dx * dx + dy * dy < last.safeR2) return last.cell
    }
    last = discOf(latLngToCell(lat, lon, resolution))
    return last.cell
  }
}

export function parentCell(cell: string, resolution = LOOP_RESOLUTION): string {
  return cellToParent(cell, resolution)
}

/** The cell's corners as [lat, lon] pairs. */
export function cellCorners(cell: string): [number, number][] {
  return cellToBoundary(cell) as [number, number][]
}

export function cellCentre(cell: string): [number, number] {
  return cellToLatLng(cell) as [number, number]
}
