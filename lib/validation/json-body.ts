// Bounded work for JSON bodies: the bytes are counted while the stream is read (chunked or not, whatever
// Content-Length says), and the nesting is measured in one pass over the text before JSON.parse runs.

/** Deeper than any body the API takes (a drive file nests 4 levels); refused before parsing. */
export const MAX_JSON_DEPTH = 32

export class BodyTooLargeError extends Error {
  constructor(readonly maxBytes: number) {
    super(`The body is over ${maxBytes} bytes.`)
    this.name = "BodyTooLargeError"
  }
}

/**
 * Reads a body stream to text, stopping (and cancelling the stream) as soon as more than `maxBytes` arrived.
 * A declared Content-Length over the limit is refused before any byte is read.
 */
export async function readBodyText(
  body: ReadableStream<Uint8Array> | null,
  maxBytes: number,
  declaredLength?: number,
): Promise<string> {
  return (await readBodyBytes(body, maxBytes, declaredLength)).toString("utf8")
}

/** The body's bytes, read up to `maxBytes` whatever Content-Length says (a chunked body is counted as it comes). */
export async function readBodyBytes(
  body: ReadableStream<Uint8Array> | null,
  maxBytes: number,
  declaredLength?: number,
): Promise<Buffer> {
  if (declaredLength !== undefined && Number.isFinite(declaredLength) && declaredLength > maxBytes)
    throw new BodyTooLargeError(maxBytes)
  if (!body) return Buffer.alloc(0)
  const reader = body.getReader()
  const chunks: Uint8Array[] = []
  let total = 0
  for (;;) {
    const { done, value } = await reader.read()
    if (done) break
    total += value.byteLength
    if (total > maxBytes) {
      await reader.cancel().catch(() => {})
      throw new BodyTooLargeError(maxBytes)
    }
    chunks.push(value)
  }
  return Buffer.concat(chunks, total)
}

/**
 * Whether JSON text nests arrays and objects deeper than `limit`, in one linear pass (brackets inside strings
 * do not count). Malformed text is left to JSON.parse.
 */
export function jsonNestsDeeperThan(text: string, limit: number): boolean {
  let depth = 0
  let inString = false
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i)
    if (inString) {
      if (c === 0x5c)
        i++ // backslash: skip the escaped character
      else if (c === 0x22) inString = false
      continue
    }
    if (c === 0x22) inString = true
    else if (c === 0x5b || c === 0x7b) {
      depth++
      if (depth > limit) return true
    } else if (c === 0x5d || c === 0x7d) depth--
  }
  return false
}
