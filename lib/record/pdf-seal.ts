// The drive record PDF's revision line and its "Check this record" block: verification code, verify address
// and a QR code drawn as vector squares (qrcode's matrix, no image). Kept apart from pdf.ts so the record's
// layout and its seal can change independently.
import { type PDFFont, type PDFPage, rgb } from "pdf-lib"
import QRCode from "qrcode"
import { formatDateTime } from "@/lib/format"
import type { RecordSeal } from "./types"

const INK = rgb(0.1, 0.12, 0.14)
const MUTED = rgb(0.36, 0.4, 0.45)

/** The address a QR code on the record opens: the verify page with the code filled in. */
export function verifyLink(seal: RecordSeal): string {
  return `${seal.verifyUrl}?code=${encodeURIComponent(seal.code)}`
}

/** When the revision was sealed, in the shop's time zone with the zone named, as every time on the record. */
function sealedAtWords(seal: RecordSeal, timeZone?: string | null): string {
  return formatDateTime(seal.revisedAt, timeZone, { zoneName: true })
}

export function revisionLine(seal: RecordSeal, timeZone?: string | null): string {
  return `Revision ${seal.revision} of this record, sealed ${sealedAtWords(seal, timeZone)}. Verification code ${seal.code}.`
}

/** Draws the QR code with its top-left corner at (x, top); returns its side in points. */
export function drawQrCode(page: PDFPage, text: string, x: number, top: number, side: number): number {
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" })
  const n = qr.modules.size
  const quiet = 4 // the standard's quiet zone, in modules (ISO/IEC 18004)
  const cell = side / (n + 2 * quiet)
  page.drawRectangle({ x, y: top - side, width: side, height: side, color: rgb(1, 1, 1) })
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      if (!qr.modules.get(r, c)) continue
      page.drawRectangle({
        x: x + (quiet + c) * cell,
        y: top - (quiet + r + 1) * cell,
        width: cell,
        height: cell,
        color: INK,
      })
    }
  }
  return side
}

/** The text lines beside the QR code. */
export function verificationLines(
  seal: RecordSeal,
  timeZone?: string | null,
): Array<{ text: string; bold?: boolean; muted?: boolean }> {
  return [
    { text: `Verification code: ${seal.code}`, bold: true },
    { text: `Revision ${seal.revision}, sealed ${sealedAtWords(seal, timeZone)}.` },
    { text: `Check it at ${seal.verifyUrl}: scan the square or type the code, or upload this PDF.` },
    { text: "The page says whether this is the latest revision of the record the shop issued.", muted: true },
    {
      text: "Every change to the drive's record after the finish makes a new revision with its own code.",
      muted: true,
    },
  ]
}

export function drawVerificationText(
  page: PDFPage,
  fonts: { font: PDFFont; bold: PDFFont },
  lines: string[][],
  x: number,
  top: number,
  styles: Array<{ bold?: boolean; muted?: boolean }>,
) {
  let y = top
  lines.forEach((wrapped, i) => {
    for (const line of wrapped) {
      page.drawText(line, {
        x,
        y: y - 10,
        size: 10,
        font: styles[i]?.bold ? fonts.bold : fonts.font,
        color: styles[i]?.muted ? MUTED : INK,
      })
      y -= 13.5
    }
    y -= 2
  })
  return top - y
}
