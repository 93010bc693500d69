import type { Content, TDocumentDefinitions } from "pdfmake/interfaces"
import {
  DECISION_WORD,
  describeVehicle,
  MARK_LABEL,
  METHOD_LABEL,
  REASON_LABEL,
  RECORD_CAUTIONS,
  SENSOR_LABEL,
  VERDICT_WORD,
} from "./format"
import { describeConditions, describeReasons, formatAgainst } from "@/lib/format/conditions"
import {
  describeTimeZone,
  DEFAULT_PREFS,
  formatDateTime,
  formatDistance,
  formatDuration,
  formatLengthFt,
  formatSpeedMph,
  plural,
} from "@/lib/format"
import {
  CONTENT_W,
  heading,
  INK,
  keepHeadings,
  MARGIN,
  MUTED,
  note,
  PAGE_H,
  PAGE_W,
  placeableImage,
  renderPdf,
  RULE,
  rows,
  STATE_COLOUR,
  VERDICT_COLOUR,
  type Row,
} from "./pdf-kit"
import { speedChart } from "./pdf-speed-chart"
import { revisionLine, verificationBlock } from "./pdf-seal"
import { projectTrack, STATE_LABEL, thinTimeline } from "./timeline"
import { checkWords, measurementWords, scanResultWords } from "./calibrations"
import type { RecordData } from "./types"

// The drive record PDF, laid out with pdfmake: this file says what the record shows, section by section;
// pdf-kit.ts holds the fonts, colours and the shared row and heading pieces.

/** Builds the drive record PDF from plain data; no I/O. The same data gives the same bytes. */
export async function buildDriveRecordPdf(data: RecordData): Promise<Uint8Array> {
  const vehicleText = describeVehicle(data.vehicle, data.vehicleDescription)
  const footer = `Drive record ${data.driveId} - ${data.shopName}`
  const made = new Date(data.generatedAt)
  const images: Record<string, string> = {}
  const doc: TDocumentDefinitions = {
    pageSize: { width: PAGE_W, height: PAGE_H },
    pageMargins: [MARGIN, MARGIN, MARGIN, MARGIN],
    info: {
      title: `Drive record - ${vehicleText}${data.vehicle ? ` - VIN ${data.vehicle.vin}` : ""}`,
      author: data.shopName,
      creator: "Straightaway",
      producer: "Straightaway",
      creationDate: made,
      modDate: made,
    },
    language: "en-US",
    defaultStyle: { font: "Roboto", fontSize: 10, color: INK, lineHeight: 1.15 },
    footer: (page, pages) => ({
      text: `${footer} - page ${page} of ${pages}`,
      fontSize: 8,
      color: MUTED,
      margin: [MARGIN, 20, MARGIN, 0],
    }),
    pageBreakBefore: keepHeadings,
    content: recordContent(data, vehicleText, images),
    images,
  }
  return renderPdf(doc)
}

function recordContent(data: RecordData, vehicleText: string, images: Record<string, string>): Content[] {
  const score = data.score
  const byKey = (key: string) => score.conditions?.find((c) => c.key === key)
  // The shop's units and time zone (lib/format) for every number and time on the record.
  const units = data.units ?? DEFAULT_PREFS.units
  const zone = data.timeZone ?? DEFAULT_PREFS.timeZone
  const fmtDateTime = (iso: string) => formatDateTime(iso, zone, { zoneName: true })
  const described = describeReasons(score, units)
  const out: Content[] = []

  // Title block
  out.push(
    { text: "Drive record", fontSize: 22, bold: true },
    { text: `${data.shopName} - calibration drive on public roads`, fontSize: 11, color: MUTED, margin: [0, 0, 0, 4] },
    { text: `Made ${fmtDateTime(data.generatedAt)}. Drive ${data.driveId}.`, fontSize: 8, color: MUTED },
    {
      text: `Times are in the shop's time zone, ${describeTimeZone(zone, data.startedAt ?? data.generatedAt)}.`,
      fontSize: 8,
      color: MUTED,
      margin: [0, 0, 0, 6],
    },
  )
  if (data.seal)
    out.push({ text: revisionLine(data.seal, data.timeZone), fontSize: 8, color: MUTED, margin: [0, 0, 0, 6] })

  // Verdict box
  const colour = VERDICT_COLOUR[score.verdict] ?? INK
  const reviewLine = data.review
    ? `${DECISION_WORD[data.review.decision]} by ${data.review.reviewerName ?? "a shop lead"}`
    : "Not reviewed by a shop lead"
  out.push({
    table: {
      widths: ["*"],
      body: [
        [
          {
            columns: [
              {
                width: 148,
                stack: [
                  { text: "Verdict", fontSize: 9, bold: true, color: MUTED },
                  { text: VERDICT_WORD[score.verdict] ?? score.verdict, fontSize: 18, bold: true, color: colour },
                ],
              },
              { width: "*", text: reviewLine, margin: [0, 12, 0, 0] },
            ],
          },
        ],
      ],
    },
    layout: {
      hLineWidth: () => 2,
      vLineWidth: () => 2,
      hLineColor: () => colour,
      vLineColor: () => colour,
      paddingLeft: () => 12,
      paddingRight: () => 12,
      paddingTop: () => 6,
      paddingBottom: () => 6,
    },
    margin: [0, 4, 0, 8],
  })
  if (described.reasons.length) for (const reason of described.reasons) out.push({ text: `- ${reason}` })
  else out.push({ text: "Every condition the verdict rests on was met." })
  for (const n of described.notes) out.push(note(`Note: ${n}`))

  // Job and vehicle
  const job: Row[] = data.job
    ? [
        { label: "Repair order", value: data.job.roNumber },
        { label: "Customer", value: data.job.customerName },
      ]
    : [{ label: "Repair order", value: "Unplanned drive (no job)" }]
  job.push({ label: "Vehicle", value: vehicleText })
  if (data.vehicle) {
    job.push({ label: "VIN", value: data.vehicle.vin })
    if (data.vehicle.plate) job.push({ label: "Plate", value: data.vehicle.plate })
  }
  if (data.task) {
    job.push(
      { label: "Sensor", value: SENSOR_LABEL[data.task.sensor] ?? data.task.sensor },
      { label: "Calibration", value: METHOD_LABEL[data.task.method] ?? data.task.method },
      { label: "Reason for calibrating", value: REASON_LABEL[data.task.reason] ?? data.task.reason },
    )
  }
  if (data.profileName) job.push({ label: "Condition profile", value: data.profileName })
  out.push(heading("Job and vehicle"), rows(job))

  // Drive summary
  const qual = byKey("qualifying-time")
  const foll = byKey("following-time")
  const verified = byKey("verified")
  const harsh = score.harshEvents ?? { accel: 0, decel: 0 }
  const drive: Row[] = [
    { label: "Started", value: data.startedAt ? fmtDateTime(data.startedAt) : "Not recorded" },
    { label: "Duration", value: formatDuration(score.durationSeconds ?? 0) },
    { label: "Distance", value: formatDistance(score.distanceMeters ?? 0, units) },
    {
      label: "Qualifying time before the learn completed",
      value: formatAgainst(score.qualifyingSecondsBeforeClear, qual?.required),
      mark: qual ? (qual.met ? "OK" : "SHORT") : undefined,
    },
    {
      label: "Following time before the learn completed",
      value: formatAgainst(score.followingSecondsBeforeClear, foll?.required),
      mark: foll ? (foll.met ? "OK" : "SHORT") : undefined,
    },
    {
      label: "Learn reported complete",
      value:
        score.clearedAtSeconds == null
          ? "No learn-complete mark"
          : `${formatDuration(score.clearedAtSeconds)} into the drive`,
      mark: score.clearedAtSeconds == null ? "NO" : "OK",
    },
    {
      label: "Function check",
      value: verified?.met
        ? `Driver-assist seen working after the learn completed at ${formatSpeedMph(verified.value, units)} (${formatSpeedMph(verified.required, units)} or faster needed)`
        : (describeConditions(score, units).find((c) => c.key === "verified")?.reason ?? "No function check recorded"),
      mark: verified ? (verified.met ? "OK" : "NO") : undefined,
    },
    {
      label: "Harsh events",
      value: `${plural(harsh.decel, "hard braking", "hard braking")}, ${plural(harsh.accel, "hard acceleration", "hard acceleration")} (advisory)`,
      mark: harsh.accel + harsh.decel === 0 ? "OK" : "NOTE",
    },
  ]
  if ((score.gapSeconds ?? 0) > 0)
    drive.push({ label: "Position data gaps", value: `${formatDuration(score.gapSeconds)} in total` })
  out.push(heading("The drive"), rows(drive))

  out.push(
    heading("Every condition"),
    rows(
      describeConditions(score, units).map((c) => ({
        label: c.label,
        value: `${c.value}${c.requirement ? `; ${c.requirement}` : ""}`,
        mark: c.state === "met" ? "OK" : c.state === "advisory" ? "NOTE" : "NO",
      })),
    ),
  )

  const track = trackBlock(data)
  if (track) out.push(track)
  const chart = speedChart(data, units)
  if (chart) out.push(chart)

  // Crew
  out.push(
    heading("Who drove and who logged"),
    rows([
      { label: "Driver", value: data.driverName ?? "Not recorded" },
      { label: "Co-driver", value: data.coDriverName ?? "None" },
      { label: "Marks logged by", value: data.markLoggers.length ? data.markLoggers.join(", ") : "Not recorded" },
    ]),
  )
  const t0 = score.startedAtMs ?? data.marks[0]?.t ?? 0
  const shownMarks = data.marks.filter((m) => m.kind !== "gap" || data.marks.length < 40).slice(0, 40)
  for (const m of shownMarks) {
    const detail =
      m.kind === "note" ? `: ${m.text ?? ""}` : m.gapFt != null ? ` (${formatLengthFt(m.gapFt, units)})` : ""
    out.push({
      text: `${formatDuration(Math.max(0, (m.t - t0) / 1000))}  ${MARK_LABEL[m.kind] ?? m.kind}${detail}${m.byName ? ` - ${m.byName}` : ""}`,
      fontSize: 9,
      margin: [10, 1, 0, 1],
    })
  }

  // Checklist
  out.push(heading("Checks before the drive"))
  if (data.checklist) {
    const checks: Row[] = data.checklist.rows.map((r) => ({
      label: r.label,
      value: r.value,
      mark: r.ok === null ? undefined : r.ok ? "OK" : "NO",
    }))
    if (data.checklist.notes) checks.push({ label: "Notes", value: data.checklist.notes })
    checks.push(...whoRow("Checked by", data.checklist.completedBy, data.checklist.completedAt, fmtDateTime))
    out.push(rows(checks))
  } else out.push({ text: "No checklist was recorded for this drive.", color: MUTED })
  out.push(...photoBlocks(data, images))
  out.push(...calibrationBlocks(data, fmtDateTime))

  // Review
  out.push(heading("Shop lead's review"))
  if (data.review) {
    const review: Row[] = [
      { label: "Decision", value: DECISION_WORD[data.review.decision] },
      { label: "Reviewed by", value: `${data.review.reviewerName ?? "A shop lead"}, ${fmtDateTime(data.review.at)}` },
    ]
    if (data.review.note) review.push({ label: "Note", value: data.review.note })
    out.push(rows(review))
  } else out.push({ text: "This drive has not been reviewed.", color: MUTED })

  if (data.seal) out.push(verificationBlock(data.seal, data.timeZone))

  // Cautions
  out.push({
    unbreakable: true,
    stack: [
      heading("Please read", true),
      ...RECORD_CAUTIONS.map((caution): Content => ({ text: `- ${caution}`, margin: [0, 0, 0, 2] })),
    ],
  })
  return out
}

/** The track drawn from the phone's positions, coloured by state; heading, picture and legend on one page. */
function trackBlock(data: RecordData): Content | null {
  const points = thinTimeline(data.timeline, 1500)
  if (points.length < 2) return null
  const height = 220
  const paths = projectTrack(points, CONTENT_W, height, 10)
  const legend = (["qualifying", "following", "slow", "gap"] as const).map((state) => ({
    width: 110,
    columns: [
      { width: 14, canvas: [{ type: "rect" as const, x: 0, y: 4, w: 14, h: 4, color: STATE_COLOUR[state] }] },
      { width: "*", text: STATE_LABEL[state], fontSize: 8, color: MUTED },
    ],
    columnGap: 4,
  }))
  return {
    unbreakable: true,
    stack: [
      heading("Track", true),
      {
        // projectTrack's coordinates have their origin at the box's top-left with y growing downward, as SVG's.
        svg: trackSvg(paths, CONTENT_W, height),
        width: CONTENT_W,
        margin: [0, 0, 0, 6],
      },
      { columns: legend, columnGap: 0, margin: [0, 0, 0, 4] },
      note("Drawn from the phone's positions; no map. Amber: qualifying speed. Teal: following a lead vehicle.", 8),
    ],
  }
}

// SVG rather than pdfmake's canvas polylines: pdfmake offsets a polyline's points in place, so one laid out twice
// (a block moved to the next page) lands in the wrong place.
function trackSvg(paths: ReturnType<typeof projectTrack>, width: number, height: number): string {
  const lines = paths.map((path) => {
    const d = path.points.map(([x, y], i) => `${i ? "L" : "M"}${x.toFixed(1)} ${y.toFixed(1)}`).join(" ")
    const w = path.state === "gap" ? 1 : 2.5
    return `<path d="${d}" fill="none" stroke="${STATE_COLOUR[path.state]}" stroke-width="${w}" stroke-linejoin="round" stroke-linecap="round"/>`
  })
  const frame = `<rect x="0.4" y="0.4" width="${width - 0.8}" height="${height - 0.8}" fill="none" stroke="${RULE}" stroke-width="0.75"/>`
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">${frame}${lines.join("")}</svg>`
}

/** Up to 12 photos, three to a row, each with its file name; a photo pdfkit cannot read is named instead. */
function photoBlocks(data: RecordData, images: Record<string, string>): Content[] {
  const out: Content[] = []
  const placed: Array<{ key: string; filename: string }> = []
  for (const photo of data.photos.slice(0, 12)) {
    if (!placeableImage(photo.bytes)) {
      out.push(note(`Photo ${photo.filename} could not be read.`))
      continue
    }
    const key = `photo-${placed.length}`
    images[key] = `data:${photo.contentType};base64,${Buffer.from(photo.bytes).toString("base64")}`
    placed.push({ key, filename: photo.filename })
  }
  const cell = (CONTENT_W - 20) / 3
  for (let i = 0; i < placed.length; i += 3) {
    const group = placed.slice(i, i + 3)
    while (group.length < 3) group.push({ key: "", filename: "" })
    out.push({
      table: {
        widths: [cell, cell, cell],
        body: [
          group.map((p) => (p.key ? { image: p.key, fit: [cell, cell], alignment: "center" as const } : { text: "" })),
          group.map((p) => ({ text: p.filename, fontSize: 7, color: MUTED })),
        ],
        dontBreakRows: true,
      },
      layout: {
        hLineWidth: () => 0,
        vLineWidth: () => 0,
        paddingLeft: (col) => (col === 0 ? 0 : 10),
        paddingRight: () => 0,
        paddingTop: () => 3,
        paddingBottom: () => 3,
      },
      unbreakable: true,
      margin: [0, 4, 0, 4],
    })
  }
  return out
}

// ---- Per system of the job: static set-up, learn drive, road test ----

const verdictWord = (v: string | null) => (v ? ((VERDICT_WORD as Record<string, string>)[v] ?? v) : "not finished")

/** "Who, when": a name, with the moment after it when it was recorded. */
function whoAndWhen(who: string, at: string | null | undefined, fmtDateTime: (iso: string) => string): string {
  return at ? `${who}, ${fmtDateTime(at)}` : who
}

/** The "Checked by" or "Recorded by" row, when someone is named; no row otherwise. */
function whoRow(
  label: string,
  who: string | null | undefined,
  at: string | null | undefined,
  fmtDateTime: (iso: string) => string,
): Row[] {
  return who ? [{ label, value: whoAndWhen(who, at, fmtDateTime) }] : []
}

function calibrationBlocks(data: RecordData, fmtDateTime: (iso: string) => string): Content[] {
  const systems = data.calibrations ?? []
  if (!systems.length) return []
  const out: Content[] = [heading("Each system calibrated on this job")]
  for (const sys of systems) {
    const block: Content[] = [
      {
        text: `${SENSOR_LABEL[sys.sensor] ?? sys.sensor} - ${METHOD_LABEL[sys.method] ?? sys.method}`,
        fontSize: 12,
        bold: true,
        margin: [0, 4, 0, 3],
      },
    ]
    if (sys.method !== "dynamic") {
      if (sys.setup) {
        block.push({ text: "Static set-up (figures typed from the maker's service information)", bold: true })
        const setup: Row[] = sys.setup.measurements.map((m) => ({
          label: m.label,
          value: measurementWords(m),
          mark: m.outOfTolerance ? "NO" : "OK",
        }))
        setup.push({
          label: "Scan tool result",
          value: `${scanResultWords(sys.setup.scanResult)}${sys.setup.scanNotes ? `: ${sys.setup.scanNotes}` : ""}`,
        })
        if (sys.setup.override)
          setup.push({
            label: "Lead's override",
            value: `${sys.setup.override.note} (${whoAndWhen(sys.setup.override.by ?? "a shop lead", sys.setup.override.at, fmtDateTime)})`,
          })
        setup.push(...whoRow("Recorded by", sys.setup.recordedBy, sys.setup.recordedAt, fmtDateTime))
        block.push(rows(setup))
      } else block.push({ text: "No static set-up was recorded.", color: MUTED })
    }
    const drives: Row[] = sys.learnDrives.map((d) => ({
      label: "Learn drive",
      value: `Drive ${d.driveId.slice(0, 8)}, ${fmtDateTime(d.startedAt)}: ${verdictWord(d.verdict)}${d.thisDrive ? " (this record)" : ""}`,
    }))
    if (!sys.learnDrives.length && sys.method !== "static")
      drives.push({ label: "Learn drive", value: "None recorded" })
    drives.push({
      label: "Road test",
      value: sys.roadTest
        ? `Drive ${sys.roadTest.driveId.slice(0, 8)}: ${verdictWord(sys.roadTest.verdict)}${sys.roadTest.thisDrive ? " (this record)" : ""}`
        : "None recorded",
    })
    block.push(rows(drives))
    // One line of text per check (not a row): a long check name must not interleave with its result.
    for (const c of sys.roadTest?.checks ?? []) {
      const mark = c.status === "passed" ? "OK" : c.status === "not_equipped" && c.need !== "required" ? "N/A" : "NO"
      block.push({
        text: `${mark} - ${c.label}: ${checkWords(c, data.units ?? DEFAULT_PREFS.units)}`,
        margin: [10, 1, 0, 1],
      })
    }
    for (const caution of sys.cautions) block.push(note(`- ${caution}`))
    out.push({ stack: block, margin: [0, 0, 0, 6] })
  }
  return out
}
