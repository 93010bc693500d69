// The drive record PDF's revision line and its "Check this record" block: verification code, verify address
// and a QR code drawn as vector squares (qrcode's matrix, no image). Kept apart from pdf.ts so the record's
// layout and its seal can change independently.
import type { CanvasElement, Content } from "pdfmake/interfaces"
import QRCode from "qrcode"
import { formatDateTime } from "@/lib/format"
import { heading, INK, MUTED } from "./pdf-kit"
import type { RecordSeal } from "./types"

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

/**
 * The QR code as vector squares, `side` points wide with the standard's quiet zone of 4 modules (ISO/IEC 18004).
 * Dark modules side by side in a row are one rectangle, so no hairline seams show between them.
 */
function qrCanvas(text: string, side: number): CanvasElement[] {
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" })
  const n = qr.modules.size
  const quiet = 4
  const cell = side / (n + 2 * quiet)
  const out: CanvasElement[] = [{ type: "rect", x: 0, y: 0, w: side, h: side, color: "#ffffff" }]
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      if (!qr.modules.get(r, c)) continue
      let run = 1
      while (c + run < n && qr.modules.get(r, c + run)) run++
      out.push({ type: "rect", x: (quiet + c) * cell, y: (quiet + r) * cell, w: run * cell, h: cell, color: INK })
      c += run - 1
    }
  }
  return out
}

/** The text lines beside the QR code. */
function verificationLines(
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

/** "Check this record": the verification code, the verify address and a QR code that opens it; kept on one page. */
export function verificationBlock(seal: RecordSeal, timeZone?: string | null): Content {
  const side = 96
  return {
    unbreakable: true,
    stack: [
      heading("Check this record", true),
      {
        columns: [
          { width: side, canvas: qrCanvas(verifyLink(seal), side) },
          {
            width: "*",
            stack: verificationLines(seal, timeZone).map((l) => ({
              text: l.text,
              bold: l.bold,
              color: l.muted ? MUTED : INK,
              margin: [0, 0, 0, 2] as [number, number, number, number],
            })),
          },
        ],
        columnGap: 16,
        margin: [0, 0, 0, 6],
      },
    ],
  }
}
