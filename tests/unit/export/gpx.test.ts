import { execFileSync, spawnSync } from "node:child_process"
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs"
import { tmpdir } from "node:os"
import path from "node:path"
import { gpx as gpxToGeoJson } from "@tmcw/togeojson"
import { DOMParser } from "@xmldom/xmldom"
import { afterAll, describe, expect, it } from "vitest"
import type { DriveFile } from "@/lib/drive-file"
import { toGpx } from "@/lib/export"
import { generateDrive } from "@/lib/tracks"
import { T0, drive, mark } from "../helpers/drive"

const XSD = "/work/shared/reference/gpx-1.1.xsd"
const XMLLINT = "/usr/bin/xmllint"
const dir = mkdtempSync(path.join(tmpdir(), "gpx-test-"))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

/** Validates against the GPX 1.1 XSD (Topografix) with xmllint; fails clearly when xmllint is missing. */
function validate(xml: string): { ok: boolean; output: string } {
  if (!existsSync(XMLLINT)) throw new Error("xmllint is missing: install Debian's libxml2-utils to run the GPX checks")
  const file = path.join(dir, `t${Math.random().toString(36).slice(2)}.gpx`)
  writeFileSync(file, xml)
  const r = spawnSync(XMLLINT, ["--noout", "--schema", XSD, file], { encoding: "utf8" })
  return { ok: r.status === 0, output: `${r.stdout}${r.stderr}` }
}

interface ReadBackFeature {
  geometry: { type: string; coordinates: unknown } | null
  properties: Record<string, unknown> | null
}

function readBack(xml: string): { features: ReadBackFeature[] } {
  const doc = new DOMParser().parseFromString(xml, "text/xml")
  return gpxToGeoJson(doc as unknown as Document) as unknown as { features: ReadBackFeature[] }
}

function trackCoordinates(fc: ReturnType<typeof readBack>): number[][] {
  const track = fc.features.find((f) => f.geometry?.type === "LineString" || f.geometry?.type === "MultiLineString")!
  const g = track.geometry!
  if (g.type === "LineString") return g.coordinates as number[][]
  if (g.type === "MultiLineString") return (g.coordinates as number[][][]).flat()
  throw new Error("no track")
}

describe("toGpx", () => {
  it("has xmllint available (the GPX checks below rely on it)", () => {
    expect(existsSync(XMLLINT), "xmllint is missing: install libxml2-utils").toBe(true)
    expect(execFileSync(XMLLINT, ["--version"], { encoding: "utf8", stdio: ["ignore", "pipe", "pipe"] })).toBeDefined()
  })

  it("validates against the GPX 1.1 schema, root version 1.1 with creator and namespace", () => {
    const file = generateDrive({ seed: 1, minutes: 16, pattern: "met", dataGaps: 1 })
    const xml = toGpx(file, { name: "Invented drive <A&B>", description: "Radar learn" })
    const v = validate(xml)
    expect(v.ok, v.output).toBe(true)
    // GPX 1.1 XSD: targetNamespace, version fixed "1.1", creator required
    expect(xml).toMatch(/<gpx xmlns="http:\/\/www\.topografix\.com\/GPX\/1\/1"/)
    expect(xml).toMatch(/ version="1\.1"/)
    expect(xml).toMatch(/ creator="Straightaway"/)
    expect(xml.indexOf("<metadata>")).toBeLessThan(xml.indexOf("<wpt"))
    expect(xml.lastIndexOf("</wpt>")).toBeLessThan(xml.indexOf("<trk>"))
  })

  it("fails validation when the schema is broken on purpose (the check can fail)", () => {
    const xml = toGpx(generateDrive({ seed: 2, minutes: 2, pattern: "never-cleared" })).replace(
      'version="1.1"',
      'version="1.0"',
    )
    expect(validate(xml).ok).toBe(false)
  })

  it("starts a new trkseg after each data gap", () => {
    const file = generateDrive({ seed: 3, minutes: 16, pattern: "met", dataGaps: 2 })
    const xml = toGpx(file)
    expect(xml.match(/<trkseg>/g)).toHaveLength(3)
  })

  it("writes a track across longitude 180 that validates, with 180 written as -180", () => {
    const file = generateDrive({
      seed: 4,
      minutes: 3,
      pattern: "never-cleared",
      startLat: -16.8,
      startLon: 179.99,
      headingDeg: 90,
    })
    const lons = file.samples.map((s) => s.lon)
    expect(lons.some((l) => l > 179.9) && lons.some((l) => l < -179.9)).toBe(true)
    file.samples.push({ t: file.samples.at(-1)!.t + 1000, lat: -16.8, lon: 180, speed: 0 })
    const xml = toGpx(file)
    const v = validate(xml)
    expect(v.ok, v.output).toBe(true)
    expect(xml).toContain('lon="-180"')
    expect(xml).not.toMatch(/lon="180"/)
  })

  it("reads back the same points and times with @tmcw/togeojson", () => {
    const file = generateDrive({
      seed: 5,
      minutes: 4,
      pattern: "never-cleared",
      startLat: 10,
      startLon: 179.995,
      headingDeg: 80,
    })
    const back = readBack(toGpx(file))
    const coords = trackCoordinates(back)
    expect(coords).toHaveLength(file.samples.filter((s) => (s.accuracy ?? 0) <= 30).length)
    const kept = file.samples.filter((s) => (s.accuracy ?? 0) <= 30)
    coords.forEach(([lon, lat], i) => {
      expect(lat).toBeCloseTo(kept[i]!.lat, 9)
      expect(lon).toBeCloseTo(kept[i]!.lon >= 180 ? kept[i]!.lon - 360 : kept[i]!.lon, 9)
    })
    const track = back.features.find((f) => f.geometry?.type !== "Point")!
    const times = (track.properties as { coordinateProperties?: { times?: string[] | string[][] } })
      .coordinateProperties?.times
    expect(times?.flat()[0]).toBe(new Date(kept[0]!.t).toISOString())
    const points = back.features.filter((f) => f.geometry?.type === "Point")
    expect(points).toHaveLength(file.marks.length)
  })

  it("puts speed and lead gap in trkpt extensions under our namespace, and marks as waypoints", () => {
    const samples = [
      { t: T0, lat: 44, lon: -92, speed: 20, accuracy: 4 },
      { t: T0 + 1000, lat: 44.0002, lon: -92, speed: 21.5, accuracy: 4 },
      { t: T0 + 2000, lat: 44.0004, lon: -92 },
    ]
    const file: DriveFile = drive(samples, [
      mark(1, "lead-on", { gapFt: 130 }),
      mark(1.5, "note", { text: "Lead turned off" }),
    ])
    const xml = toGpx(file)
    expect(validate(xml).ok).toBe(true)
    expect(xml).toContain('xmlns:sa="https://straightaway.invalid/gpx/1"')
    expect(xml).toContain(
      '<trkpt lat="44.0002" lon="-92"><time>2026-01-01T10:00:01.000Z</time><extensions><sa:speedMps>21.5</sa:speedMps><sa:accuracyM>4</sa:accuracyM><sa:leadOn>true</sa:leadOn><sa:gapFt>130</sa:gapFt></extensions></trkpt>',
    )
    // the note sits halfway between samples 1 and 2
    const note = xml.match(
      /<wpt lat="([^"]+)" lon="([^"]+)">\n<time>2026-01-01T10:00:01\.500Z<\/time>\n<name>Note<\/name>\n<desc>Lead turned off<\/desc>/,
    )
    expect(note).not.toBeNull()
    expect(Number(note![1])).toBeCloseTo(44.0003, 9)
    expect(Number(note![2])).toBe(-92)
  })

  it("writes an empty drive as a valid GPX file", () => {
    const v = validate(toGpx(drive([], [mark(0, "note", { text: "no fix" })])))
    expect(v.ok, v.output).toBe(true)
  })

  it("stays well-formed XML when a note holds characters XML 1.0 does not allow (U+FFFE, U+FFFF, controls, a lone surrogate)", () => {
    // XML 1.0 (Fifth Edition) section 2.2, production [2] Char.
    const samples = [
      { t: T0, lat: 44, lon: -92, speed: 20, accuracy: 4 },
      { t: T0 + 1000, lat: 44.0002, lon: -92, speed: 21, accuracy: 4 },
    ]
    const text = "a\uFFFEb\uFFFFc\u0001d\u001Fe\uD800f 🚗 g\th"
    const xml = toGpx(drive(samples, [mark(0.5, "note", { text })]))
    const v = validate(xml)
    expect(v.ok, v.output).toBe(true)
    expect(xml).toContain("<desc>abcdef 🚗 g\th</desc>")
  })
})
