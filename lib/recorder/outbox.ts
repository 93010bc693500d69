// The outbox: every write the recorder makes, kept in order until the server has it. Pure logic;
// the storage (IndexedDB) and the transport (fetch) are passed in, so the same code runs in the
// browser, in unit tests and in the sync benchmark.
import type { ApiMark, Sample } from "@/lib/drive-file/schema"
import { backoffDelayMs } from "./backoff"
import { SEND_MAX_MARKS, SEND_MAX_SAMPLES, groupBatchId, groupForSending } from "./batching"

export type OutboxPayload =
  | { type: "create-drive"; body: Record<string, unknown> }
  | { type: "samples"; batchId: string; samples: Sample[] }
  | { type: "marks"; marks: ApiMark[] }
  | { type: "delete-mark"; markId: string }
  | { type: "finish" }

export type OutboxItem = OutboxPayload & {
  /** Sortable: creation time then a counter. */
  key: string
  driveId: string
  attempts: number
  /** ms since the epoch; 0 = now. */
  notBeforeMs: number
  /** Set when the server refused it (4xx): kept and shown, never retried by itself. */
  failed?: { status: number; code: string; message: string }
}

export interface Transport {
  /** Resolves with the HTTP status and parsed body; rejects when there is no network. */
  request(method: "POST" | "DELETE", path: string, body?: unknown): Promise<{ status: number; body: unknown }>
}

export interface OutboxStore {
  list(): Promise<OutboxItem[]>
  remove(keys: string[]): Promise<void>
  put(items: OutboxItem[]): Promise<void>
}

export type FlushOutcome =
  | { kind: "done"; sent: number }
  | { kind: "offline"; sent: number; retryAtMs: number }
  | { kind: "signed-out"; sent: number }

let counter = 0
function outboxKey(nowMs: number): string {
  counter = (counter + 1) % 1_000_000
  return `${String(nowMs).padStart(15, "0")}-${String(counter).padStart(6, "0")}-${Math.random().toString(36).slice(2, 8)}`
}

export function makeItem(driveId: string, payload: OutboxPayload, nowMs: number): OutboxItem {
  return { ...payload, key: outboxKey(nowMs), driveId, attempts: 0, notBeforeMs: 0 }
}

function groupKey(item: OutboxItem): string | null {
  if (item.failed) return null
  if (item.type === "samples" || item.type === "marks") return `${item.type}:${item.driveId}`
  return null
}

function sizeOf(item: OutboxItem): number {
  if (item.type === "samples") return item.samples.length
  if (item.type === "marks") return item.marks.length
  return 1
}

function requestFor(group: OutboxItem[]): { method: "POST" | "DELETE"; path: string; body?: unknown } {
  const first = group[0]!
  const base = `/api/drives/${first.driveId}`
  switch (first.type) {
    case "create-drive":
      return { method: "POST", path: "/api/drives", body: { ...first.body, id: first.driveId } }
    case "samples": {
      const items = group as Array<Extract<OutboxItem, { type: "samples" }>>
      return {
        method: "POST",
        path: `${base}/samples`,
        body: { batchId: groupBatchId(items.map((i) => i.batchId)), samples: items.flatMap((i) => i.samples) },
      }
    }
    case "marks":
      return {
        method: "POST",
        path: `${base}/marks`,
        body: { marks: (group as Array<Extract<OutboxItem, { type: "marks" }>>).flatMap((i) => i.marks) },
      }
    case "delete-mark":
      return { method: "DELETE", path: `${base}/marks/${first.markId}` }
    case "finish":
      return { method: "POST", path: `${base}/finish` }
  }
}

/** What to do with an answer: 2xx done; 401 wait for sign-in; other 4xx final; 5xx and no answer retry. */
function classifyStatus(status: number): "ok" | "signed-out" | "refused" | "retry" {
  if (status >= 200 && status < 300) return "ok"
  if (status === 401) return "signed-out"
  if (status >= 400 && status < 500 && status !== 408 && status !== 429) return "refused"
  return "retry"
}

export interface FlushOptions {
  nowMs?: () => number
  random?: () => number
  /** Called after each answered request, e.g. to update "last synced". */
  onSent?: (items: OutboxItem[], body: unknown) => void
  onRefused?: (item: OutboxItem) => void
}

/**
 * Sends what is due, oldest first, joining neighbouring sample pieces into bodies of up to
 * SEND_MAX_SAMPLES. Stops at the first network failure or 5xx (the rest would fail the same way)
 * and gives that item its next retry time. A 4xx marks the item failed and carries on.
 */
export async function flushOutbox(
  store: OutboxStore,
  transport: Transport,
  options: FlushOptions = {},
): Promise<FlushOutcome> {
  const now = options.nowMs ?? Date.now
  const random = options.random ?? Math.random
  let sent = 0

  async function send(group: OutboxItem[]) {
    const req = requestFor(group)
    try {
      const { status, body } = await transport.request(req.method, req.path, req.body)
      return { verdict: classifyStatus(status), status, body }
    } catch {
      return { verdict: "retry" as const, status: 0, body: null }
    }
  }

  async function refuse(item: OutboxItem, status: number, body: unknown) {
    const err = (body as { error?: { code?: string; message?: string } } | null)?.error
    const failed: OutboxItem = {
      ...item,
      failed: { status, code: err?.code ?? "refused", message: err?.message ?? `Refused (${status})` },
    }
    await store.put([failed])
    options.onRefused?.(failed)
  }

  for (;;) {
    const items = (await store.list()).filter((i) => !i.failed).sort((a, b) => (a.key < b.key ? -1 : 1))
    if (items.length === 0) return { kind: "done", sent }
    const due = items[0]!
    if (due.notBeforeMs > now()) return { kind: "offline", sent, retryAtMs: due.notBeforeMs }
    const maxSize = due.type === "marks" ? SEND_MAX_MARKS : SEND_MAX_SAMPLES
    let group = groupForSending(items, groupKey, sizeOf, maxSize)[0]!.items
    let answer = await send(group)
    if (answer.verdict === "refused" && group.length > 1) {
      // The refusal may belong to one part only: send the first part alone to find out.
      group = [due]
      answer = await send(group)
    }
    if (answer.verdict === "ok") {
      await store.remove(group.map((i) => i.key))
      sent += group.length
      options.onSent?.(group, answer.body)
      continue
    }
    if (answer.verdict === "signed-out") return { kind: "signed-out", sent }
    if (answer.verdict === "refused") {
      await refuse(due, answer.status, answer.body)
      continue
    }
    const attempts = due.attempts + 1
    const retryAtMs = now() + backoffDelayMs(attempts, random)
    await store.put([{ ...due, attempts, notBeforeMs: retryAtMs }])
    return { kind: "offline", sent, retryAtMs }
  }
}

/** An in-memory store, for tests and the benchmark. */
export function memoryOutboxStore(initial: OutboxItem[] = []): OutboxStore & { items: Map<string, OutboxItem> } {
  const items = new Map(initial.map((i) => [i.key, i]))
  return {
    items,
    async list() {
      return [...items.values()]
    },
    async remove(keys) {
      for (const k of keys) items.delete(k)
    },
    async put(list) {
      for (const i of list) items.set(i.key, i)
    },
  }
}
