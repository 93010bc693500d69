import { describe, expect, it } from "vitest"
import { SAMPLE_CSV_COLUMNS, csvField, toCsv, toMarksCsv } from "@/lib/export"
import { crlfLineEnds } from "@/lib/export/csv"
import { T0, drive, mark } from "../helpers/drive"

/** Minimal RFC 4180 reader for the round-trip checks. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = []
  let row: string[] = []
  let field = ""
  let quoted = false
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"'
        i++
      } else if (c === '"') quoted = false
      else field += c
    } else if (c === '"') quoted = true
    else if (c === ",") {
      row.push(field)
      field = ""
    } else if (c === "\r" && text[i + 1] === "\n") {
      row.push(field)
      rows.push(row)
      row = []
      field = ""
      i++
    } else field += c
  }
  return rows
}

describe("toCsv", () => {
  const samples = [
    { t: T0 + 2000, lat: 44.0004, lon: -92.5, speed: 20, accuracy: 5 },
    { t: T0, lat: 44, lon: -92.5, speed: 15.6464, accuracy: 4 },
    { t: T0 + 1000, lat: 44.0002, lon: -92.5, accuracy: 40 },
    { t: T0 + 2000, lat: 44.1, lon: -92.5, speed: 0 },
    { t: T0 + 3000, lat: 0.0000001, lon: -92.5, speed: null, accuracy: null },
  ]
  const csv = toCsv(drive(samples, [mark(1, "lead-on", { gapFt: 130 })]))
  const rows = parseCsv(csv)

  it("has a header with units in the column names and CRLF line ends", () => {
    expect(rows[0]).toEqual([...SAMPLE_CSV_COLUMNS])
    expect(rows[0]).toContain("speed_mps")
    expect(rows[0]).toContain("gap_ft")
    expect(csv.endsWith("\r\n")).toBe(true)
    expect(csv.split("\r\n")).toHaveLength(samples.length + 2)
  })

  it("lists every sample in time order with whether it was kept and why not", () => {
    const col = (name: string) => SAMPLE_CSV_COLUMNS.indexOf(name as (typeof SAMPLE_CSV_COLUMNS)[number])
    const body = rows.slice(1)
    expect(body.map((r) => r[col("t_ms")])).toEqual([T0, T0 + 1000, T0 + 2000, T0 + 2000, T0 + 3000].map(String))
    expect(body.map((r) => r[col("kept")])).toEqual(["true", "false", "true", "false", "true"])
    expect(body.map((r) => r[col("drop_reason")])).toEqual(["", "accuracy", "", "duplicate-time", ""])
    expect(body[0]![col("time_utc")]).toBe("2026-01-01T10:00:00.000Z")
    // NIST SP 811: 15.6464 m/s = 35 mph exactly
    expect(body[0]![col("speed_mph")]).toBe("35")
    expect(body.map((r) => r[col("lead_on")])).toEqual(["false", "true", "true", "true", "true"])
    expect(body[1]![col("gap_ft")]).toBe("130")
    expect(body[4]![col("lat_deg")]).toBe("0.0000001") // never exponent notation
    expect(body[4]![col("speed_mps")]).toBe("")
  })
})

describe("toMarksCsv and RFC 4180 quoting", () => {
  it("quotes commas, quotes and line breaks, and defuses formulas", () => {
    expect(csvField("plain")).toBe("plain")
    expect(csvField('say "hi", then go')).toBe('"say ""hi"", then go"')
    expect(csvField("two\r\nlines")).toBe('"two\r\nlines"')
    expect(csvField("=HYPERLINK(1)")).toBe("'=HYPERLINK(1)")
    const csv = toMarksCsv(
      drive([], [mark(5, "note", { text: 'Lead "grey van", 140 ft' }), mark(1, "gap", { gapFt: 140 })]),
    )
    const rows = parseCsv(csv)
    expect(rows).toEqual([
      ["time_utc", "t_ms", "kind", "gap_ft", "text"],
      ["2026-01-01T10:00:01.000Z", String(T0 + 1000), "gap", "140", ""],
      ["2026-01-01T10:00:05.000Z", String(T0 + 5000), "note", "", 'Lead "grey van", 140 ft'],
    ])
  })
})

describe("crlfLineEnds", () => {
  // Lines as PostgreSQL's COPY ... CSV writes them (LF after each row), with fields quoted as csvField quotes them.
  const rows = [
    ["drive_id", "technician", "unmet"],
    ["a1", 'Ana, "Bo" Díaz', "cleared time-limit"],
    ["b2", "Line one\nLine two", ""],
    ["c3", "Carriage\r\nreturn", '""'],
    ["d4", '"\n"', "山田\n"],
    ["e5", "", "plain"],
  ].map((r) => r.map(csvField).join(","))
  const lf = new TextEncoder().encode(rows.map((r) => `${r}\n`).join(""))
  const crlf = rows.map((r) => `${r}\r\n`).join("")
  const run = (chunks: Uint8Array[]) => {
    const convert = crlfLineEnds()
    return Buffer.concat(chunks.map((c) => convert(c))).toString("utf8")
  }

  it("ends each row with CRLF and leaves line breaks inside quoted fields as they are", () => {
    expect(run([lf])).toBe(crlf)
    expect(parseCsv(run([lf]))[3]).toEqual(["c3", "Carriage\r\nreturn", '""'])
  })

  it("gives the same bytes however the text is cut into chunks", () => {
    for (let cut = 0; cut <= lf.length; cut++) expect(run([lf.subarray(0, cut), lf.subarray(cut)])).toBe(crlf)
    expect(run(Array.from(lf, (b) => Uint8Array.of(b)))).toBe(crlf)
  })

  it("hands back a chunk without a line end as it is", () => {
    const chunk = new TextEncoder().encode("no line end here")
    expect(crlfLineEnds()(chunk)).toBe(chunk)
  })
})
