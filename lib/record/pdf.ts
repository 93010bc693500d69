import { PDFDocument, type PDFFont, type PDFImage, type PDFPage, rgb, StandardFonts, type RGB } from "pdf-lib"
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
import { drawSpeedChart } from "./pdf-speed-chart"
import { drawQrCode, drawVerificationText, revisionLine, verificationLines, verifyLink } from "./pdf-seal"
import { projectTrack, STATE_LABEL, thinTimeline, type StretchState } from "./timeline"
import { checkWords, measurementWords, scanResultWords } from "./calibrations"
import type { RecordData } from "./types"

// US Letter in points; margins wide enough for a hole punch.
const PAGE_W = 612
const PAGE_H = 792
const MARGIN = 50
const CONTENT_W = PAGE_W - 2 * MARGIN

const INK = rgb(0.1, 0.12, 0.14)
const MUTED = rgb(0.36, 0.4, 0.45)
const RULE = rgb(0.82, 0.84, 0.85)
const STATE_COLOUR: Record<StretchState, RGB> = {
  qualifying: rgb(0.96, 0.64, 0.04), // signal amber
  following: rgb(0.08, 0.66, 0.6), // teal
  slow: rgb(0.49, 0.53, 0.58), // graphite
  gap: rgb(0.82, 0.84, 0.85),
}
const VERDICT_COLOUR = {
  met: rgb(0.05, 0.5, 0.47),
  short: rgb(0.56, 0.36, 0),
  not_met: rgb(0.72, 0.2, 0.16),
  unverified: rgb(0.56, 0.36, 0),
}

// The standard fonts speak Windows-1252 only; anything else becomes a plain look-alike or "?".
const CP1252_EXTRA = "€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ"
const SWAPS: Record<string, string> = {
  "≥": ">=",
  "≤": "<=",
  "→": "->",
  "←": "<-",
  "−": "-",
  "·": "·",
  "✓": "OK",
  "✗": "X",
}
export function toWinAnsi(text: string): string {
  let out = ""
  for (const ch of text.normalize("NFC")) {
    const code = ch.codePointAt(0)!
    if (ch === "\n" || (code >= 0x20 && code <= 0x7e) || (code >= 0xa0 && code <= 0xff) || CP1252_EXTRA.includes(ch))
      out += ch
    else if (ch === "\t") out += " "
    else out += SWAPS[ch] ?? "?"
  }
  return out
}

export class Writer {
  page!: PDFPage
  y = 0
  pageNumber = 0
  constructor(
    readonly doc: PDFDocument,
    readonly font: PDFFont,
    readonly bold: PDFFont,
    readonly footer: string,
  ) {
    this.newPage()
  }

  newPage() {
    this.page = this.doc.addPage([PAGE_W, PAGE_H])
    this.pageNumber += 1
    this.y = PAGE_H - MARGIN
    this.page.drawText(toWinAnsi(`${this.footer} - page ${this.pageNumber}`), {
      x: MARGIN,
      y: 28,
      size: 8,
      font: this.font,
      color: MUTED,
    })
  }

  ensure(height: number) {
    if (this.y - height < MARGIN) this.newPage()
  }

  wrap(text: string, font: PDFFont, size: number, width: number): string[] {
    const lines: string[] = []
    for (const paragraph of toWinAnsi(text).split("\n")) {
      let line = ""
      for (const word of paragraph.split(/\s+/).filter(Boolean)) {
        const next = line ? `${line} ${word}` : word
        if (font.widthOfTextAtSize(next, size) <= width || !line) line = next
        else {
          lines.push(line)
          line = word
        }
      }
      lines.push(line)
    }
    return lines
  }

  text(
    text: string,
    opts: { size?: number; bold?: boolean; color?: RGB; x?: number; width?: number; gap?: number } = {},
  ) {
    const size = opts.size ?? 10
    const font = opts.bold ? this.bold : this.font
    const x = opts.x ?? MARGIN
    const lines = this.wrap(text, font, size, opts.width ?? CONTENT_W - (x - MARGIN))
    for (const line of lines) {
      this.ensure(size * 1.35)
      this.page.drawText(line, { x, y: this.y - size, size, font, color: opts.color ?? INK })
      this.y -= size * 1.35
    }
    this.y -= opts.gap ?? 2
  }

  heading(text: string) {
    this.ensure(40)
    this.y -= 10
    this.page.drawText(toWinAnsi(text), { x: MARGIN, y: this.y - 13, size: 13, font: this.bold, color: INK })
    this.y -= 18
    this.page.drawLine({
      start: { x: MARGIN, y: this.y },
      end: { x: PAGE_W - MARGIN, y: this.y },
      thickness: 0.75,
      color: RULE,
    })
    this.y -= 6
  }

  /** Label on the left, value wrapped on the right. */
  row(label: string, value: string, opts: { valueColor?: RGB; mark?: string } = {}) {
    const labelW = 190
    const lines = this.wrap(value, this.font, 10, CONTENT_W - labelW - 30)
    const labelLines = this.wrap(label, this.bold, 10, labelW - 10)
    const height = Math.max(lines.length, labelLines.length) * 13.5
    this.ensure(height + 2)
    const top = this.y
    labelLines.forEach((line, i) =>
      this.page.drawText(line, { x: MARGIN, y: top - 10 - i * 13.5, size: 10, font: this.bold, color: MUTED }),
    )
    lines.forEach((line, i) =>
      this.page.drawText(line, {
        x: MARGIN + labelW,
        y: top - 10 - i * 13.5,
        size: 10,
        font: this.font,
        color: opts.valueColor ?? INK,
      }),
    )
    if (opts.mark)
      this.page.drawText(toWinAnsi(opts.mark), {
        x: PAGE_W - MARGIN - 24,
        y: top - 10,
        size: 9,
        font: this.bold,
        color: opts.valueColor ?? INK,
      })
    this.y = top - height - 3
  }
}

/** Builds the drive record PDF from plain data; no I/O. */
export async function buildDriveRecordPdf(data: RecordData): Promise<Uint8Array> {
  const doc = await PDFDocument.create()
  const vehicleText = describeVehicle(data.vehicle, data.vehicleDescription)
  doc.setTitle(toWinAnsi(`Drive record - ${vehicleText}${data.vehicle ? ` - VIN ${data.vehicle.vin}` : ""}`))
  doc.setAuthor(toWinAnsi(data.shopName))
  doc.setCreator("Straightaway")
  doc.setProducer("Straightaway")
  doc.setCreationDate(new Date(data.generatedAt))
  const font = await doc.embedFont(StandardFonts.Helvetica)
  const bold = await doc.embedFont(StandardFonts.HelveticaBold)
  const w = new Writer(doc, font, bold, `Drive record ${data.driveId} - ${data.shopName}`)
  const score = data.score
  const byKey = (key: string) => score.conditions?.find((c) => c.key === key)
  // The shop's units and time zone (lib/format) for every number and time on the record.
  const units = data.units ?? DEFAULT_PREFS.units
  const zone = data.timeZone ?? DEFAULT_PREFS.timeZone
  const fmtDateTime = (iso: string) => formatDateTime(iso, zone, { zoneName: true })
  const described = describeReasons(score, units)

  // Title block
  w.text("Drive record", { size: 22, bold: true, gap: 0 })
  w.text(`${data.shopName} - calibration drive on public roads`, { size: 11, color: MUTED, gap: 4 })
  w.text(`Made ${fmtDateTime(data.generatedAt)}. Drive ${data.driveId}.`, { size: 8, color: MUTED, gap: 0 })
  w.text(`Times are in the shop's time zone, ${describeTimeZone(zone, data.startedAt ?? data.generatedAt)}.`, {
    size: 8,
    color: MUTED,
    gap: 8,
  })
  if (data.seal) w.text(revisionLine(data.seal, data.timeZone), { size: 8, color: MUTED, gap: 8 })

  // Verdict box
  w.ensure(60)
  const verdictWord = VERDICT_WORD[score.verdict] ?? score.verdict
  const boxTop = w.y
  w.page.drawRectangle({
    x: MARGIN,
    y: boxTop - 44,
    width: CONTENT_W,
    height: 44,
    borderColor: VERDICT_COLOUR[score.verdict],
    borderWidth: 2,
  })
  w.page.drawText("Verdict", { x: MARGIN + 12, y: boxTop - 18, size: 9, font: bold, color: MUTED })
  w.page.drawText(toWinAnsi(verdictWord), {
    x: MARGIN + 12,
    y: boxTop - 37,
    size: 18,
    font: bold,
    color: VERDICT_COLOUR[score.verdict],
  })
  const reviewLine = data.review
    ? `${DECISION_WORD[data.review.decision]} by ${data.review.reviewerName ?? "a shop lead"}`
    : "Not reviewed by a shop lead"
  w.page.drawText(toWinAnsi(reviewLine), { x: MARGIN + 160, y: boxTop - 30, size: 10, font, color: INK })
  w.y = boxTop - 52
  if (described.reasons.length) for (const reason of described.reasons) w.text(`- ${reason}`, { size: 10 })
  else w.text("Every condition the verdict rests on was met.", { size: 10 })
  for (const note of described.notes) w.text(`Note: ${note}`, { size: 9, color: MUTED })

  // Job and vehicle
  w.heading("Job and vehicle")
  if (data.job) {
    w.row("Repair order", data.job.roNumber)
    w.row("Customer", data.job.customerName)
  } else w.row("Repair order", "Unplanned drive (no job)")
  w.row("Vehicle", vehicleText)
  if (data.vehicle) {
    w.row("VIN", data.vehicle.vin)
    if (data.vehicle.plate) w.row("Plate", data.vehicle.plate)
  }
  if (data.task) {
    w.row("Sensor", SENSOR_LABEL[data.task.sensor] ?? data.task.sensor)
    w.row("Calibration", METHOD_LABEL[data.task.method] ?? data.task.method)
    w.row("Reason for calibrating", REASON_LABEL[data.task.reason] ?? data.task.reason)
  }
  if (data.profileName) w.row("Condition profile", data.profileName)

  // Drive summary
  w.heading("The drive")
  const qual = byKey("qualifying-time")
  const foll = byKey("following-time")
  const verified = byKey("verified")
  w.row("Started", data.startedAt ? fmtDateTime(data.startedAt) : "Not recorded")
  w.row("Duration", formatDuration(score.durationSeconds ?? 0))
  w.row("Distance", formatDistance(score.distanceMeters ?? 0, units))
  w.row(
    "Qualifying time before the learn completed",
    formatAgainst(score.qualifyingSecondsBeforeClear, qual?.required),
    {
      mark: qual ? (qual.met ? "OK" : "SHORT") : undefined,
    },
  )
  w.row("Following time before the learn completed", formatAgainst(score.followingSecondsBeforeClear, foll?.required), {
    mark: foll ? (foll.met ? "OK" : "SHORT") : undefined,
  })
  w.row(
    "Learn reported complete",
    score.clearedAtSeconds == null
      ? "No learn-complete mark"
      : `${formatDuration(score.clearedAtSeconds)} into the drive`,
    {
      mark: score.clearedAtSeconds == null ? "NO" : "OK",
    },
  )
  w.row(
    "Function check",
    verified?.met
      ? `Driver-assist seen working after the learn completed at ${formatSpeedMph(verified.value, units)} (${formatSpeedMph(verified.required, units)} or faster needed)`
      : (describeConditions(score, units).find((c) => c.key === "verified")?.reason ?? "No function check recorded"),
    { mark: verified ? (verified.met ? "OK" : "NO") : undefined },
  )
  const harsh = score.harshEvents ?? { accel: 0, decel: 0 }
  w.row(
    "Harsh events",
    `${plural(harsh.decel, "hard braking", "hard braking")}, ${plural(harsh.accel, "hard acceleration", "hard acceleration")} (advisory)`,
    {
      mark: harsh.accel + harsh.decel === 0 ? "OK" : "NOTE",
    },
  )
  if ((score.gapSeconds ?? 0) > 0) w.row("Position data gaps", `${formatDuration(score.gapSeconds)} in total`)

  w.heading("Every condition")
  for (const c of describeConditions(score, units)) {
    w.row(c.label, `${c.value}${c.requirement ? `; ${c.requirement}` : ""}`, {
      mark: c.state === "met" ? "OK" : c.state === "advisory" ? "NOTE" : "NO",
    })
  }

  drawTrack(w, data)
  drawSpeedChart(w, data, units)

  // Crew
  w.heading("Who drove and who logged")
  w.row("Driver", data.driverName ?? "Not recorded")
  w.row("Co-driver", data.coDriverName ?? "None")
  w.row("Marks logged by", data.markLoggers.length ? data.markLoggers.join(", ") : "Not recorded")
  const t0 = score.startedAtMs ?? data.marks[0]?.t ?? 0
  const shownMarks = data.marks.filter((m) => m.kind !== "gap" || data.marks.length < 40).slice(0, 40)
  for (const m of shownMarks) {
    const detail =
      m.kind === "note" ? `: ${m.text ?? ""}` : m.gapFt != null ? ` (${formatLengthFt(m.gapFt, units)})` : ""
    w.text(
      `${formatDuration(Math.max(0, (m.t - t0) / 1000))}  ${MARK_LABEL[m.kind] ?? m.kind}${detail}${m.byName ? ` - ${m.byName}` : ""}`,
      { size: 9, x: MARGIN + 10 },
    )
  }

  // Checklist
  w.heading("Checks before the drive")
  if (data.checklist) {
    for (const r of data.checklist.rows)
      w.row(r.label, r.value, { mark: r.ok === null ? undefined : r.ok ? "OK" : "NO" })
    if (data.checklist.notes) w.row("Notes", data.checklist.notes)
    if (data.checklist.completedBy)
      w.row(
        "Checked by",
        `${data.checklist.completedBy}${data.checklist.completedAt ? `, ${fmtDateTime(data.checklist.completedAt)}` : ""}`,
      )
  } else w.text("No checklist was recorded for this drive.", { color: MUTED })
  await drawPhotos(w, data)
  drawCalibrations(w, data)

  // Review
  w.heading("Shop lead's review")
  if (data.review) {
    w.row("Decision", DECISION_WORD[data.review.decision])
    w.row("Reviewed by", `${data.review.reviewerName ?? "A shop lead"}, ${fmtDateTime(data.review.at)}`)
    if (data.review.note) w.row("Note", data.review.note)
  } else w.text("This drive has not been reviewed.", { color: MUTED })

  drawVerification(w, data)

  // Cautions
  w.heading("Please read")
  for (const caution of RECORD_CAUTIONS) w.text(`- ${caution}`, { size: 10 })

  return doc.save()
}

function drawTrack(w: Writer, data: RecordData) {
  const points = thinTimeline(data.timeline, 1500)
  if (points.length < 2) return
  const height = 220
  w.ensure(height + 80) // keep the heading with its picture
  w.heading("Track")
  const top = w.y
  const paths = projectTrack(points, CONTENT_W, height, 10)
  w.page.drawRectangle({ x: MARGIN, y: top - height, width: CONTENT_W, height, borderColor: RULE, borderWidth: 0.75 })
  for (const path of paths) {
    const d = path.points.map(([x, y], i) => `${i ? "L" : "M"}${x.toFixed(1)} ${y.toFixed(1)}`).join(" ")
    // drawSvgPath puts the path's origin at (x, y) with y growing downward, as SVG does.
    w.page.drawSvgPath(d, {
      x: MARGIN,
      y: top,
      borderColor: STATE_COLOUR[path.state],
      borderWidth: path.state === "gap" ? 1 : 2.5,
    })
  }
  w.y = top - height - 8
  let x = MARGIN
  for (const state of ["qualifying", "following", "slow", "gap"] as const) {
    w.page.drawRectangle({ x, y: w.y - 9, width: 14, height: 4, color: STATE_COLOUR[state] })
    w.page.drawText(STATE_LABEL[state], { x: x + 18, y: w.y - 10, size: 8, font: w.font, color: MUTED })
    x += 110
  }
  w.y -= 18
  w.text("Drawn from the phone's positions; no map. Amber: qualifying speed. Teal: following a lead vehicle.", {
    size: 8,
    color: MUTED,
  })
}

/** "Check this record": the verification code, the verify address and a QR code that opens it. */
function drawVerification(w: Writer, data: RecordData) {
  if (!data.seal) return
  const side = 96
  const textX = MARGIN + side + 16
  const items = verificationLines(data.seal, data.timeZone)
  const wrapped = items.map((l) => w.wrap(l.text, l.bold ? w.bold : w.font, 10, CONTENT_W - side - 16))
  const textHeight = wrapped.reduce((h, lines) => h + lines.length * 13.5 + 2, 0)
  w.ensure(Math.max(side, textHeight) + 50)
  w.heading("Check this record")
  const top = w.y
  drawQrCode(w.page, verifyLink(data.seal), MARGIN, top, side)
  drawVerificationText(w.page, { font: w.font, bold: w.bold }, wrapped, textX, top, items)
  w.y = top - Math.max(side, textHeight) - 6
}

async function drawPhotos(w: Writer, data: RecordData) {
  if (!data.photos.length) return
  const images: Array<{ image: PDFImage; filename: string }> = []
  for (const photo of data.photos.slice(0, 12)) {
    try {
      const image =
        photo.contentType === "image/png" ? await w.doc.embedPng(photo.bytes) : await w.doc.embedJpg(photo.bytes)
      images.push({ image, filename: photo.filename })
    } catch {
      w.text(`Photo ${photo.filename} could not be read.`, { size: 9, color: MUTED })
    }
  }
  const cell = (CONTENT_W - 20) / 3
  for (let i = 0; i < images.length; i += 3) {
    w.ensure(cell + 20)
    const top = w.y - 6
    images.slice(i, i + 3).forEach(({ image, filename }, j) => {
      const scale = Math.min(cell / image.width, cell / image.height)
      const iw = image.width * scale
      const ih = image.height * scale
      const x = MARGIN + j * (cell + 10)
      w.page.drawImage(image, { x: x + (cell - iw) / 2, y: top - ih, width: iw, height: ih })
      w.page.drawText(toWinAnsi(filename.slice(0, 40)), { x, y: top - cell - 10, size: 7, font: w.font, color: MUTED })
    })
    w.y = top - cell - 16
  }
}

// ---- Per system of the job: static set-up, learn drive, road test (issue 13) ----

const verdictWord = (v: string | null) => (v ? ((VERDICT_WORD as Record<string, string>)[v] ?? v) : "not finished")

function drawCalibrations(w: Writer, data: RecordData) {
  const fmtDateTime = (iso: string) => formatDateTime(iso, data.timeZone ?? DEFAULT_PREFS.timeZone, { zoneName: true })
  const systems = data.calibrations ?? []
  if (!systems.length) return
  w.heading("Each system calibrated on this job")
  for (const sys of systems) {
    w.ensure(60)
    w.text(`${SENSOR_LABEL[sys.sensor] ?? sys.sensor} - ${METHOD_LABEL[sys.method] ?? sys.method}`, {
      size: 12,
      bold: true,
      gap: 4,
    })
    if (sys.method !== "dynamic") {
      if (sys.setup) {
        w.text("Static set-up (figures typed from the maker's service information)", { size: 10, bold: true })
        for (const m of sys.setup.measurements)
          w.row(m.label, measurementWords(m), { mark: m.outOfTolerance ? "NO" : "OK" })
        w.row(
          "Scan tool result",
          `${scanResultWords(sys.setup.scanResult)}${sys.setup.scanNotes ? `: ${sys.setup.scanNotes}` : ""}`,
        )
        if (sys.setup.override) {
          w.row(
            "Lead's override",
            `${sys.setup.override.note} (${sys.setup.override.by ?? "a shop lead"}${sys.setup.override.at ? `, ${fmtDateTime(sys.setup.override.at)}` : ""})`,
          )
        }
        if (sys.setup.recordedBy)
          w.row(
            "Recorded by",
            `${sys.setup.recordedBy}${sys.setup.recordedAt ? `, ${fmtDateTime(sys.setup.recordedAt)}` : ""}`,
          )
      } else w.text("No static set-up was recorded.", { color: MUTED })
    }
    if (sys.learnDrives.length) {
      for (const d of sys.learnDrives) {
        w.row(
          "Learn drive",
          `Drive ${d.driveId.slice(0, 8)}, ${fmtDateTime(d.startedAt)}: ${verdictWord(d.verdict)}${d.thisDrive ? " (this record)" : ""}`,
        )
      }
    } else if (sys.method !== "static") w.row("Learn drive", "None recorded")
    if (sys.roadTest) {
      w.row(
        "Road test",
        `Drive ${sys.roadTest.driveId.slice(0, 8)}: ${verdictWord(sys.roadTest.verdict)}${sys.roadTest.thisDrive ? " (this record)" : ""}`,
      )
      // One line of text per check (not a row): a long check name must not interleave with its result.
      for (const c of sys.roadTest.checks) {
        const mark = c.status === "passed" ? "OK" : c.status === "not_equipped" && c.need !== "required" ? "N/A" : "NO"
        w.text(`${mark} - ${c.label}: ${checkWords(c, data.units ?? "imperial")}`, { size: 10, x: MARGIN + 10 })
      }
    } else w.row("Road test", "None recorded")
    for (const caution of sys.cautions) w.text(`- ${caution}`, { size: 9, color: MUTED })
    w.y -= 6
  }
}
