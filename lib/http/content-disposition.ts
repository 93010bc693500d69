// Content-Disposition with the file's own name intact (RFC 6266): an ASCII `filename` for old clients and the
// exact UTF-8 name as `filename*` (RFC 8187, formerly RFC 5987), which every current browser prefers.

/** RFC 8187 attr-char: ALPHA / DIGIT / "!" / "#" / "$" / "&" / "+" / "-" / "." / "^" / "_" / "`" / "|" / "~". */
function encodeExtValue(text: string): string {
  return encodeURIComponent(text).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`)
}

/** "résumé 🚗.jpg" -> "resume _.jpg": accents dropped, anything else outside printable ASCII, quotes and backslashes as "_". */
export function asciiFallback(filename: string): string {
  const ascii = filename
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/[^\x20-\x7e]+/g, "_")
    .replace(/["\\]/g, "_")
    .trim()
  return ascii || "download"
}

export function contentDisposition(kind: "inline" | "attachment", filename: string): string {
  return `${kind}; filename="${asciiFallback(filename)}"; filename*=UTF-8''${encodeExtValue(filename)}`
}
