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
 * time: one frame for each array or object, linked to its parent, and the path spelled out only for the one
 * string refused. An object's keys are all checked before its values, its values last key first; an array's
 * items in order. Numbers, the bulk of a sample batch, cost nothing but their type check.
 */
export function findUnstorableText(value: unknown): { path: string; problem: string } | null {
  type Frame = {
    value: object
    /** The object's keys, or null for an array. */
    keys: string[] | null
    next: number
    key: string | number | null
    parent: Frame | null
  }
  type Found = { path: string; problem: string }
  const pathOf = (frame: Frame, last: string | number) => {
    const parts: string[] = [String(last)]
    for (let f: Frame | null = frame; f && f.key !== null; f = f.parent) parts.push(String(f.key))
    return parts.reverse().join(".") || "(body)"
  }
  const open = (v: object, key: string | number | null, parent: Frame | null): Frame | Found => {
    if (Array.isArray(v)) return { value: v, keys: null, next: 0, key, parent }
    const keys = Object.keys(v)
    const frame: Frame = { value: v, keys, next: keys.length - 1, key, parent }
    for (const k of keys) {
      const problem = unstorableTextProblem(k)
      if (problem) return { path: pathOf(frame, "(key)"), problem }
    }
    return frame
  }
  if (typeof value === "string") {
    const problem = unstorableTextProblem(value)
    return problem ? { path: "(body)", problem } : null
  }
  if (value === null || typeof value !== "object") return null
  const root = open(value, null, null)
  if (!("value" in root)) return root
  const stack: Frame[] = [root]
  while (stack.length) {
    const frame = stack[stack.length - 1]!
    const { keys, next } = frame
    if (keys ? next < 0 : next >= (frame.value as unknown[]).length) {
      stack.pop()
      continue
    }
    frame.next = keys ? next - 1 : next + 1
    const key = keys ? keys[next]! : next
    const child = (frame.value as Record<string | number, unknown>)[key]
    if (typeof child === "string") {
      const problem = unstorableTextProblem(child)
      if (problem) return { path: pathOf(frame, key), problem }
    } else if (child !== null && typeof child === "object") {
      const opened = open(child, key, frame)
      if (!("value" in opened)) return opened
      stack.push(opened)
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
