// What PostgreSQL can take at all, checked before any schema: text columns refuse the NUL character and
// jsonb refuses lone UTF-16 surrogates (in text columns the driver silently turns them into U+FFFD).
// Both would otherwise surface as a 500 or as text stored differently from what was sent.

const NUL = "\u0000"

/** The problem with a piece of text that cannot be stored as sent, or null. */
export function unstorableTextProblem(text: string): string | null {
  if (text.includes(NUL)) return "must not contain the NUL character"
  if (!isWellFormedText(text)) return "must be valid Unicode text (a lone UTF-16 surrogate was sent)"
  return null
}

function isWellFormedText(text: string): boolean {
  const native = (text as { isWellFormed?: () => boolean }).isWellFormed
  if (native) return native.call(text)
  return !/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/.test(text)
}

/**
 * The first string (value or object key) in parsed JSON that cannot be stored, with its path in the
 * API's `fields` form (`marks.3.text`). Walks without recursion (bodies may be nested deeply) and in linear
 * time: each entry keeps a link to its parent, and the path is spelled out only for the one string refused.
 */
export function findUnstorableText(value: unknown): { path: string; problem: string } | null {
  type Entry = { value: unknown; key: string | null; parent: Entry | null }
  const pathOf = (entry: Entry | null, last?: string) => {
    const parts: string[] = last === undefined ? [] : [last]
    for (let e = entry; e && e.key !== null; e = e.parent) parts.push(e.key)
    return parts.reverse().join(".") || "(body)"
  }
  const stack: Entry[] = [{ value, key: null, parent: null }]
  while (stack.length) {
    const entry = stack.pop()!
    const v = entry.value
    if (typeof v === "string") {
      const problem = unstorableTextProblem(v)
      if (problem) return { path: pathOf(entry), problem }
    } else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push({ value: v[i], key: String(i), parent: entry })
    } else if (v !== null && typeof v === "object") {
      for (const [key, child] of Object.entries(v)) {
        const keyProblem = unstorableTextProblem(key)
        if (keyProblem) return { path: pathOf(entry, "(key)"), problem: keyProblem }
        stack.push({ value: child, key, parent: entry })
      }
    }
  }
  return null
}

/** The 8-4-4-4-12 hex form PostgreSQL's uuid type reads (any version). */

/**
 * Whether text is a calendar timestamp PostgreSQL's timestamptz reads without an error: ISO 8601
 * (`2026-01-02T03:04:05.123456Z`) or its own output form (`2026-01-02 03:04:05.123456+00`), with a real
 * date (no 2026-02-30) and a year from 1 to 9999.
 */
export function isTimestampText(text: string): boolean {
  const m = /^(\d{4})-(\d\d)-(\d\d)[T ](\d\d):(\d\d):(\d\d)(\.\d{1,6})?(Z|[+-]\d\d(?::?\d\d)?)$/.exec(text)
  if (!m) return false
  const [year, month, day, hour, minute, second] = m.slice(1, 7).map(Number) as [
    number,
    number,
    number,
    number,
    number,
    number,
  ]
  if (year < 1 || month < 1 || month > 12 || day < 1 || hour > 23 || minute > 59 || second > 59) return false
  const daysInMonth = new Date(Date.UTC(2000, month, 0)).getUTCDate() // 2000: a leap year, February 29
  if (day > daysInMonth) return false
  if (month === 2 && day === 29 && !(year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0))) return false
  const offset = m[8]!
  if (offset !== "Z" && Number(offset.slice(1, 3)) > 15) return false
  return true
}
