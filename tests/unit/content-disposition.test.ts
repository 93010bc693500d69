// RFC 6266 section 4.3 and RFC 8187 section 3.2 (ext-value, attr-char); the parse below follows RFC 8187's grammar.
import { describe, expect, it } from "vitest"
import { asciiFallback, contentDisposition } from "@/lib/http/content-disposition"

function filenameStar(header: string): string {
  const m = /filename\*=UTF-8''([A-Za-z0-9!#$&+\-.^_`|~%]+)$/.exec(header)
  if (!m) throw new Error(`no filename* in ${header}`)
  return decodeURIComponent(m[1]!)
}

describe("contentDisposition", () => {
  it("keeps accented, emoji and script names exactly in filename*", () => {
    for (const name of [
      "résumé.jpg",
      "🚗 front bumper.jpg",
      "تقرير.pdf",
      "車検 (2).pdf",
      "it's * 100%.pdf",
      'quote "x".pdf',
    ]) {
      const header = contentDisposition("attachment", name)
      expect(header.startsWith("attachment; ")).toBe(true)
      expect(filenameStar(header)).toBe(name)
    }
  })

  it("gives old clients a quoted ASCII name with no quote or backslash inside", () => {
    expect(asciiFallback("résumé.jpg")).toBe("resume.jpg")
    expect(asciiFallback('a"b\\c.pdf')).toBe("a_b_c.pdf")
    expect(asciiFallback("🚗.jpg")).toBe("_.jpg")
    expect(asciiFallback("車検")).toBe("_")
    expect(contentDisposition("inline", "résumé.jpg")).toBe(
      `inline; filename="resume.jpg"; filename*=UTF-8''r%C3%A9sum%C3%A9.jpg`,
    )
  })
})
