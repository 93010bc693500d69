import { PDFDocument } from "pdf-lib"

/**
 * Pages of a PDF as a PDF library reads it, or null when it is not one it can open: a file that only starts with
 * `%PDF-` (HTML behind the signature, a file cut short) has no page tree to count. Encrypted PDFs are opened to
 * count their pages only, never decrypted.
 */
export async function countPdfPages(bytes: Uint8Array): Promise<number | null> {
  try {
    const doc = await PDFDocument.load(bytes, {
      ignoreEncryption: true,
      throwOnInvalidObject: true,
      updateMetadata: false,
    })
    const pages = doc.getPageCount()
    return pages > 0 ? pages : null
  } catch {
    return null
  }
}
