// The drive record's layout toolkit on pdfmake (pdfkit underneath): fonts, colours, page geometry, the heading
// and label/value rows every section uses, and the call that turns a document definition into bytes.
import path from "node:path"
import { inflateSync } from "node:zlib"
import PDFKitDocument from "pdfkit"
import pdfmake from "pdfmake"
import type { Content, ContentTable, CustomTableLayout, TDocumentDefinitions } from "pdfmake/interfaces"

// US Letter in points; margins wide enough for a hole punch.
export const PAGE_W = 612
export const PAGE_H = 792
export const MARGIN = 50
export const CONTENT_W = PAGE_W - 2 * MARGIN

/** An RGB colour from 0..1 components, as pdfmake takes it. */
const rgb = (r: number, g: number, b: number) =>
  `#${[r, g, b]
    .map((v) =>
      Math.round(v * 255)
        .toString(16)
        .padStart(2, "0"),
    )
    .join("")}`

export const INK = rgb(0.1, 0.12, 0.14)
export const MUTED = rgb(0.36, 0.4, 0.45)
export const RULE = rgb(0.82, 0.84, 0.85)
export const STATE_COLOUR = {
  qualifying: rgb(0.96, 0.64, 0.04), // signal amber
  following: rgb(0.08, 0.66, 0.6), // teal
  slow: rgb(0.49, 0.53, 0.58), // graphite
  gap: RULE,
} as const
export const VERDICT_COLOUR: Record<string, string> = {
  met: rgb(0.05, 0.5, 0.47),
  short: rgb(0.56, 0.36, 0),
  not_met: rgb(0.72, 0.2, 0.16),
  unverified: rgb(0.56, 0.36, 0),
}
export const BAND = rgb(0.99, 0.9, 0.66)
export const LINE = rgb(0.16, 0.18, 0.2)

// Roboto, the TrueType family pdfmake ships in its own package: full Latin (accents, ß, Ł), Greek and Cyrillic, so
// any name comes out as typed. The app's Inter is a variable WOFF2, which fontkit (under pdfkit) cannot subset.
// Read from the project's node_modules at run time: Next's docs name process.cwd() (the project root for `next
// start`, the tests and the scripts) as the way to reach files from server code, as bundling moves __dirname.
const FONT_DIR = path.join(process.cwd(), "node_modules", "pdfmake", "fonts", "Roboto")
const FONT_FILES = {
  normal: path.join(FONT_DIR, "Roboto-Regular.ttf"),
  bold: path.join(FONT_DIR, "Roboto-Medium.ttf"),
  italics: path.join(FONT_DIR, "Roboto-Italic.ttf"),
  bolditalics: path.join(FONT_DIR, "Roboto-MediumItalic.ttf"),
}
const ALLOWED_FILES = new Set(Object.values(FONT_FILES))
pdfmake.setFonts({ Roboto: { ...FONT_FILES } })
// Nothing from the network, and from the disk only the fonts: a record is built from its data alone.
pdfmake.setUrlAccessPolicy(() => false)
pdfmake.setLocalAccessPolicy((file) => ALLOWED_FILES.has(path.resolve(file)))

/** Lays out and writes the document; the same definition gives the same bytes (dates come from the definition). */
export async function renderPdf(doc: TDocumentDefinitions): Promise<Uint8Array> {
  return new Uint8Array(await pdfmake.createPdf(doc).getBuffer())
}

/**
 * A section heading with its rule; near the foot of a page it moves to the next (see keepHeadings). Inside an
 * unbreakable block pass `inBlock`: the block keeps it with its content, and a page break asked for inside an
 * unbreakable block leaves blank pages in pdfmake.
 */
export function heading(text: string, inBlock = false): Content {
  return {
    stack: [
      { text, fontSize: 13, bold: true, margin: [0, 10, 0, 3] },
      {
        canvas: [{ type: "line", x1: 0, y1: 0, x2: CONTENT_W, y2: 0, lineWidth: 0.75, lineColor: RULE }],
        margin: [0, 0, 0, 5],
      },
    ],
    headlineLevel: inBlock ? undefined : 1,
  }
}

/** pageBreakBefore: a heading with less than this much room below it starts the next page. */
export function keepHeadings(node: { headlineLevel?: number; startPosition: { top: number } }): boolean {
  return node.headlineLevel === 1 && node.startPosition.top > PAGE_H - MARGIN - 64
}

export interface Row {
  label: string
  value: string
  /** OK, SHORT, NO, NOTE, N/A: printed at the right edge. */
  mark?: string
  valueColor?: string
}

const LABEL_W = 170
const MARK_W = 28

const ROWS_LAYOUT: CustomTableLayout = {
  hLineWidth: (i, node) => (i === 0 || i === node.table.body.length ? 0 : 0.5),
  hLineColor: () => "#eceeef",
  vLineWidth: () => 0,
  paddingLeft: (i) => (i === 0 ? 0 : i === 1 ? 10 : 8),
  paddingRight: () => 0,
  paddingTop: () => 1.5,
  paddingBottom: () => 1.5,
}

/** Label on the left, value wrapped in the middle, a mark at the right edge; a row never splits over two pages. */
export function rows(items: Row[]): ContentTable {
  return {
    table: {
      widths: [LABEL_W, "*", MARK_W],
      dontBreakRows: true,
      body: items.map((r) => [
        { text: r.label, bold: true, color: MUTED },
        { text: r.value, color: r.valueColor ?? INK },
        { text: r.mark ?? "", bold: true, fontSize: 9, alignment: "right", color: r.valueColor ?? INK },
      ]),
    },
    layout: ROWS_LAYOUT,
    margin: [0, 0, 0, 2],
  }
}

/** A line of muted small print. */
export const note = (text: string, fontSize = 9): Content => ({ text, fontSize, color: MUTED, margin: [0, 1, 0, 1] })

interface ImageOpener {
  openImage(src: Buffer): {
    width: number
    height: number
    imgData?: Buffer
    image?: { hasAlphaChannel?: boolean; transparency?: { indexed?: unknown } }
  }
}
let scratch: ImageOpener | null = null

/**
 * Whether pdfkit can place these bytes as an image: a JPEG or PNG whose header it reads. A PNG with transparency
 * is inflated here too, as pdfkit inflates those later in a callback where a failure could not be caught.
 */
export function placeableImage(bytes: Uint8Array): { width: number; height: number } | null {
  scratch ??= new (PDFKitDocument as unknown as new (opts: object) => ImageOpener)({ autoFirstPage: false })
  try {
    const image = scratch.openImage(Buffer.from(bytes))
    if (image.imgData && (image.image?.hasAlphaChannel || image.image?.transparency?.indexed))
      inflateSync(image.imgData)
    return image.width > 0 && image.height > 0 ? { width: image.width, height: image.height } : null
  } catch {
    return null
  }
}
