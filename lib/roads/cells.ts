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

interface CellShape {
  cell: string
  lat: number
  lon: number
  cosLat: number
  /** Square of a radius (m) inside which every point is in the cell, with a margin. */
  safeR2: number
  /** The edges as half-planes in local metres around the centre: inside when nx*x + ny*y < c (margin taken off). */
  edges: Float64Array
}

/**
 * Finds the res-9 cell of each point of a track. A point well inside the last cell's hexagon (drawn in
 * local metres around its centre, with a margin of at least 1 m, or 2 % of the cell's size for the coarse
 * resolutions, against the flat approximation) is in that cell; so is a point well inside the cell before it
 * (a track wavering along an edge). Only the points near an edge, or in a new cell, take the H3 look-up. The
 * answer is the same as latLngToCell for every point (checked against it in tests/unit/roads).
 */
export function createCellLocator(resolution = ROAD_RESOLUTION) {
  const shapes = new Map<string, CellShape>()
  let last: CellShape | null = null
  let before: CellShape | null = null
  const shapeOf = (cell: string): CellShape => {
    let shape = shapes.get(cell)
    if (!shape) {
      const [lat, lon] = cellToLatLng(cell)
      const cosLat = Math.cos((lat * Math.PI) / 180)
      const ring = cellToBoundary(cell).map(
        ([a, b]) => [(b - lon) * cosLat * M_PER_DEG_LAT, (a - lat) * M_PER_DEG_LAT] as const,
      )
      const raw: [number, number, number][] = []
      let inner = Infinity
      for (let i = 0; i < ring.length; i++) {
        const [x1, y1] = ring[i]!
        const [x2, y2] = ring[(i + 1) % ring.length]!
        const len = Math.hypot(x2 - x1, y2 - y1)
        // the edge's unit normal pointing away from the centre (0,0), and the centre's distance to the edge
        let nx = (y2 - y1) / len
        let ny = -(x2 - x1) / len
        let c = nx * x1 + ny * y1
        if (c < 0) {
          nx = -nx
          ny = -ny
          c = -c
        }
        raw.push([nx, ny, c])
        if (c < inner) inner = c
      }
      const margin = Math.max(1, inner * 0.02)
      const edges = new Float64Array(raw.length * 3)
      raw.forEach(([nx, ny, c], i) => edges.set([nx, ny, c - margin], i * 3))
      const safe = inner - margin
      shape = { cell, lat, lon, cosLat, safeR2: safe * safe, edges }
      shapes.set(cell, shape)
    }
    return shape
  }
  const holds = (shape: CellShape, lat: number, lon: number): boolean => {
    const y = (lat - shape.lat) * M_PER_DEG_LAT
    const x = (lon - shape.lon) * shape.cosLat * M_PER_DEG_LAT
    if (x * x + y * y < shape.safeR2) return true
    const e = shape.edges
    for (let k = 0; k < e.length; k += 3) if (e[k]! * x + e[k + 1]! * y >= e[k + 2]!) return false
    return true
  }
  return (lat: number, lon: number): string => {
    if (last && holds(last, lat, lon)) return last.cell
    if (before && holds(before, lat, lon)) {
      const b = before
      before = last
      last = b
      return b.cell
    }
    const next = shapeOf(latLngToCell(lat, lon, resolution))
    if (next !== last) {
      before = last
      last = next
    }
    return next.cell
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
