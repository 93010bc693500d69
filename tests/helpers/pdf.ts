import { PDFParse } from "pdf-parse"

/** The text of a PDF's pages as pdf-parse reads it. */
export async function pdfText(bytes: Uint8Array) {
  const parser = new PDFParse({ data: Buffer.from(bytes) })
  try {
    return (await parser.getText()).text
  } finally {
    await parser.destroy()
  }
}
