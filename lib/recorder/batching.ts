// How recorded samples are cut into pieces: small pieces written to IndexedDB about every second (so
// a killed app loses at most that much), and larger POST bodies when the outbox catches up.

/** Write the buffer to IndexedDB once it is this old... */
export const PERSIST_EVERY_MS = 1000
/** ...or this long, whichever comes first. */
export const PERSIST_MAX_SAMPLES = 20
/** While online, stored samples go to the server once the oldest unsent one is this old... */
export const SEND_EVERY_MS = 5000
/** ...or this many are unsent, whichever comes first. Marks and Finish go at once. */
export const SEND_AT_SAMPLES = 50
/** Samples in one POST when several stored pieces are waiting. */
export const SEND_MAX_SAMPLES = 2000
export const SEND_MAX_MARKS = 200

export function shouldPersist(buffered: number, oldestBufferedAtMs: number | null, nowMs: number): boolean {
  if (buffered === 0 || oldestBufferedAtMs === null) return false
  return buffered >= PERSIST_MAX_SAMPLES || nowMs - oldestBufferedAtMs >= PERSIST_EVERY_MS
}

export function shouldSend(unsent: number, oldestUnsentAtMs: number | null, nowMs: number): boolean {
  if (unsent === 0 || oldestUnsentAtMs === null) return false
  return unsent >= SEND_AT_SAMPLES || nowMs - oldestUnsentAtMs >= SEND_EVERY_MS
}

export interface SendGroup<T> {
  items: T[]
  size: number
}

/**
 * Joins adjacent outbox items of the same kind and drive into groups no larger than `maxSize`
 * (an item bigger than that still goes alone). Order is kept; nothing is split.
 */
export function groupForSending<T>(
  items: readonly T[],
  keyOf: (item: T) => string | null,
  sizeOf: (item: T) => number,
  maxSize: number,
): Array<SendGroup<T>> {
  const groups: Array<SendGroup<T> & { key: string | null }> = []
  for (const item of items) {
    const key = keyOf(item)
    const size = sizeOf(item)
    const last = groups.at(-1)
    if (last && key !== null && last.key === key && last.size + size <= maxSize) {
      last.items.push(item)
      last.size += size
    } else {
      groups.push({ key, items: [item], size })
    }
  }
  return groups.map(({ items: i, size }) => ({ items: i, size }))
}

/**
 * A batch id for a group, from its first and last parts and their number, so a replay of the same
 * group is recognised; a differently cut group gets another id and the server's per-time check
 * keeps it from storing anything twice.
 */
export function groupBatchId(batchIds: readonly string[]): string {
  if (batchIds.length === 1) return batchIds[0]!
  return `${batchIds[0]}~${batchIds.at(-1)!.slice(0, 8)}~${batchIds.length}`
}

/** The header a sample batch's id travels in besides its body, so that a replay is answered before the body is read. */
export const BATCH_ID_HEADER = "x-batch-id"
