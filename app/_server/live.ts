// The live picture of a drive, per app process:
// - one LISTEN connection (DRIVE_CHANNEL) feeding an in-process bus, so a mark stored by any process
//   reaches every screen watching the drive, whichever process serves it;
// - a bounded cache of live scorers (lib/scoring createLiveScorer), built from the database once and
//   then appended to as samples and marks are stored, so reading a recording drive never rescores it whole;
// - the Server-Sent Events stream and the polling answer of GET /api/drives/:id/live.
// While the LISTEN connection is down the cache is not trusted (scores are computed from the database)
// and open streams are closed, so their screens reconnect and resume from their last event id.
import "server-only"
import pg from "pg"
import { getDb, type Db } from "@/db/client"
import {
  DRIVE_CHANNEL,
  findDriveEvent,
  insertDriveEvent,
  lastDriveEventId,
  listDriveEventsAfter,
  listMarksWithSeq,
  liveOrigin,
  type DriveEvent,
  type DriveEventKind,
  type DriveNotice,
} from "@/db/queries/drive-events"
import { loadDriveFile } from "@/db/queries/drive-file"
import { findDriveInShop } from "@/db/queries/drives"
import { listSamples } from "@/db/queries/samples"
import { storedSample } from "@/lib/drive-file/stored"
import { findScore } from "@/db/queries/scores"
import type { Drive } from "@/db/types"
import type { Mark, Sample } from "@/lib/drive-file/schema"
import { createLiveScorer, scoreDrive, type LiveScorer } from "@/lib/scoring/score"
import type { Score } from "@/lib/scoring/types"

/** Live scorers kept per process (a 10 Hz hour is ~3 MB): the least recently read goes first. */
const MAX_CACHED_DRIVES = 16
/** A heartbeat on every open stream this often, so proxies keep it and screens know it is alive. */
const HEARTBEAT_MS = 10_000
/** At most one score event per drive this often (scores follow samples, which come every second). */
const SCORE_EVERY_MS = 1000
/** A screen that loses its stream tries again after this (the `retry:` field). */
const RETRY_MS = 2000

type StoredMark = Mark & { id: string; seq: number }

type Update = { type: "samples"; samples: readonly Sample[] } | { type: "mark"; mark: StoredMark } | { type: "drop" }

interface Entry {
  driveId: string
  shopId: string
  ready: Promise<void>
  loaded: boolean
  dead: boolean
  pending: Update[]
  scorer: LiveScorer
  /** Every stored sample time (the scorer forgets those it drops for accuracy). */
  ts: Set<number>
  marks: Map<string, { t: number; seq: number }>
  score: Score | null
}

interface Watcher {
  shopId: string
  send(event: string, data: unknown, id?: number): void
  close(): void
}

interface DriveWatch {
  shopId: string
  watchers: Set<Watcher>
  scoreTimer: ReturnType<typeof setTimeout> | null
  lastScoreAt: number
}

interface Hub {
  client: pg.Client | null
  connecting: Promise<void> | null
  connected: boolean
  cache: Map<string, Entry>
  watches: Map<string, DriveWatch>
}

const globalForLive = globalThis as unknown as { straightawayLiveHub?: Hub }

function hub(): Hub {
  globalForLive.straightawayLiveHub ??= {
    client: null,
    connecting: null,
    connected: false,
    cache: new Map(),
    watches: new Map(),
  }
  return globalForLive.straightawayLiveHub
}

// ---- the LISTEN connection ----

/** Starts listening once per process; resolves when listening (or when it failed: callers then fall back). */
function ensureListening(): Promise<void> {
  const h = hub()
  if (h.connected) return Promise.resolve()
  h.connecting ??= (async () => {
    const client = new pg.Client({ connectionString: process.env.DATABASE_URL })
    client.on("notification", (msg) => {
      if (msg.channel !== DRIVE_CHANNEL || !msg.payload) return
      try {
        onNotice(JSON.parse(msg.payload) as DriveNotice)
      } catch (error) {
        console.error("[straightaway] live notice not understood", error)
      }
    })
    const lost = (error?: unknown) => {
      if (h.client !== client) return
      if (error) console.error("[straightaway] live LISTEN connection lost", error)
      h.client = null
      h.connected = false
      forgetEverything()
      void client.end().catch(() => {})
    }
    client.on("error", lost)
    client.on("end", () => lost())
    try {
      await client.connect()
      await client.query(`listen ${DRIVE_CHANNEL}`)
      h.client = client
      h.connected = true
    } catch (error) {
      console.error("[straightaway] live LISTEN failed", error)
      void client.end().catch(() => {})
    }
  })().finally(() => {
    h.connecting = null
  })
  return h.connecting
}

/** Without the LISTEN connection nothing cached can be trusted and streams may have missed events. */
function forgetEverything() {
  const h = hub()
  for (const e of h.cache.values()) e.dead = true
  h.cache.clear()
  for (const w of h.watches.values()) for (const watcher of [...w.watchers]) watcher.close()
}

function onNotice(n: DriveNotice) {
  const entry = hub().cache.get(n.d)
  if (n.k === "samples") {
    // This process applied its own batches when they committed (noteSamplesStored).
    if (n.o !== liveOrigin() && entry) {
      if (n.rows)
        apply(entry, {
          type: "samples",
          samples: n.rows.map(([t, lat, lon, speed, accuracy]) => ({ t, lat, lon, speed, accuracy })),
        })
      else apply(entry, { type: "drop" })
    }
    scheduleScore(n.d)
    return
  }
  void (async () => {
    const event: DriveEvent | undefined = n.body
      ? { id: n.id, kind: n.kind, body: n.body }
      : await findDriveEvent(getDb(), n.d, n.s, n.id).catch(() => undefined)
    if (!event) return
    if (entry) {
      if (event.kind === "mark") apply(entry, { type: "mark", mark: event.body as unknown as StoredMark })
      else if (event.kind === "unmark") apply(entry, { type: "drop" })
    }
    const watch = hub().watches.get(n.d)
    if (watch) for (const w of watch.watchers) if (w.shopId === n.s) w.send(event.kind, event.body, event.id)
    scheduleScore(n.d)
  })()
}

// ---- the live scorer cache ----

function apply(entry: Entry, u: Update) {
  if (entry.dead) return
  if (!entry.loaded) {
    entry.pending.push(u)
    return
  }
  if (u.type === "drop") {
    drop(entry)
  } else if (u.type === "samples") {
    const fresh: Sample[] = []
    for (const s of u.samples) {
      if (entry.ts.has(s.t)) continue
      entry.ts.add(s.t)
      fresh.push(s)
    }
    if (fresh.length) {
      entry.scorer.addSamples(fresh)
      entry.score = null
    }
  } else {
    const m = u.mark
    if (entry.marks.has(m.id)) return
    // Marks at the same millisecond count in arrival order: one that arrives out of order means a rebuild.
    for (const other of entry.marks.values()) {
      if (other.t === m.t && other.seq > m.seq) return drop(entry)
    }
    entry.marks.set(m.id, { t: m.t, seq: m.seq })
    const { id: _id, seq: _seq, ...mark } = m
    entry.scorer.addMarks([mark])
    entry.score = null
  }
}

function drop(entry: Entry) {
  entry.dead = true
  const h = hub()
  if (h.cache.get(entry.driveId) === entry) h.cache.delete(entry.driveId)
}

function entryFor(db: Db, drive: Drive): Entry {
  const h = hub()
  const hit = h.cache.get(drive.id)
  if (hit && hit.shopId === drive.shop_id) {
    h.cache.delete(drive.id) // most recently used goes last
    h.cache.set(drive.id, hit)
    return hit
  }
  const entry: Entry = {
    driveId: drive.id,
    shopId: drive.shop_id,
    ready: Promise.resolve(),
    loaded: false,
    dead: false,
    pending: [],
    scorer: createLiveScorer(drive.profile),
    ts: new Set(),
    marks: new Map(),
    score: null,
  }
  h.cache.set(drive.id, entry)
  while (h.cache.size > MAX_CACHED_DRIVES) drop(h.cache.values().next().value!)
  entry.ready = (async () => {
    try {
      const [samples, marks] = await Promise.all([
        listSamples(db, drive.id, drive.shop_id),
        listMarksWithSeq(db, drive.id, drive.shop_id),
      ])
      for (const s of samples) entry.ts.add(s.t)
      entry.scorer.addSamples(samples)
      for (const m of marks) entry.marks.set(m.id, { t: m.t, seq: m.seq })
      entry.scorer.addMarks(marks.map(({ id: _id, seq: _seq, ...m }) => m))
      entry.loaded = true
      for (const u of entry.pending.splice(0)) apply(entry, u)
    } catch (error) {
      drop(entry)
      throw error
    }
  })()
  return entry
}

/**
 * The score of the drive's stored samples and marks, equal to scoreDrive(loadDriveFile(...)), from the
 * process's live scorer (built on the first read, appended to after each stored batch or mark).
 */
export async function liveScore(db: Db, drive: Drive): Promise<Score> {
  await ensureListening()
  if (hub().connected) {
    for (let attempt = 0; attempt < 3; attempt++) {
      const entry = entryFor(db, drive)
      await entry.ready
      if (entry.dead) continue // dropped while loading (a mark taken back): read it again
      entry.score ??= entry.scorer.score()
      return entry.score
    }
  }
  return scoreDrive(await loadDriveFile(db, drive.id, drive.shop_id))
}

/** Sample and mark counts of a drive the process holds a live scorer for (null when it holds none). */
export function liveCounts(driveId: string): { samples: number; marks: number } | null {
  const entry = hub().cache.get(driveId)
  if (!entry || !entry.loaded || entry.dead || !hub().connected) return null
  return { samples: entry.ts.size, marks: entry.marks.size }
}

/** After a sample batch committed: the samples whose `t` this call stored go into this process's scorer. */
export function noteSamplesStored(driveId: string, samples: readonly Sample[], storedTs: readonly number[]) {
  const entry = hub().cache.get(driveId)
  if (!entry || storedTs.length === 0) return
  const want = new Set(storedTs)
  const stored: Sample[] = []
  for (const s of samples) {
    if (!want.delete(s.t)) continue // the first sample of each stored t is the one the database kept
    stored.push(storedSample(s)) // as the database keeps it (lib/drive-file/stored.ts), so live = stored score
  }
  apply(entry, { type: "samples", samples: stored })
}

/** After marks committed: into this process's scorer now (their notices may come a moment later). */
export function noteMarksStored(driveId: string, marks: readonly StoredMark[]) {
  const entry = hub().cache.get(driveId)
  if (entry) for (const mark of marks) apply(entry, { type: "mark", mark })
}

/** After a mark was taken back: the scorer has no removal, so it is built again on the next read. */
export function noteMarkRemoved(driveId: string) {
  const entry = hub().cache.get(driveId)
  if (entry) apply(entry, { type: "drop" })
}

/**
 * Tells every screen on the drive (in every process) about a change, durably: a `status` change after
 * Finish or review, or any other event kind the live channel defines. Call inside the transaction of the
 * change; the event goes out when it commits. Returns the event id.
 */
export function publishDriveEvent(
  db: Db,
  drive: Pick<Drive, "id" | "shop_id">,
  kind: DriveEventKind,
  body: Record<string, unknown>,
) {
  return insertDriveEvent(db, drive.id, drive.shop_id, kind, body)
}

/** The status body of a drive, as `status` events and snapshots carry it. */
export function statusBody(drive: Drive) {
  return {
    status: drive.status,
    verdict: drive.verdict,
    reviewStatus: drive.review_status,
    finishedAt: drive.finished_at,
  }
}

// ---- what a screen gets ----

/** The drive's score for a screen: the stored one once finished, else the live one. */
async function currentScore(db: Db, drive: Drive): Promise<Score> {
  if (drive.status === "finished") {
    const stored = await findScore(db, drive.id, drive.shop_id)
    if (stored) return stored
  }
  return liveScore(db, drive)
}

async function roNumber(db: Db, drive: Drive): Promise<string | null> {
  if (!drive.job_id) return null
  const row = await db
    .selectFrom("job")
    .select("ro_number")
    .where("id", "=", drive.job_id)
    .where("shop_id", "=", drive.shop_id)
    .executeTakeFirst()
  return row?.ro_number ?? null
}

async function snapshot(db: Db, drive: Drive) {
  const [lastEventId, marks, score, ro] = await Promise.all([
    lastDriveEventId(db, drive.id, drive.shop_id),
    listMarksWithSeq(db, drive.id, drive.shop_id),
    currentScore(db, drive),
    roNumber(db, drive),
  ])
  return {
    lastEventId,
    drive: {
      id: drive.public_id, // the recorder compares it with its own id
      roNumber: ro,
      vehicleDescription: drive.vehicle_description,
      createdAt: drive.created_at,
      ...statusBody(drive),
    },
    marks,
    score,
  }
}

function scheduleScore(driveId: string) {
  const watch = hub().watches.get(driveId)
  if (!watch || watch.scoreTimer) return
  const wait = Math.max(50, watch.lastScoreAt + SCORE_EVERY_MS - Date.now())
  watch.scoreTimer = setTimeout(() => {
    watch.scoreTimer = null
    watch.lastScoreAt = Date.now()
    void (async () => {
      const db = getDb()
      const drive = await findDriveInShop(db, driveId, watch.shopId)
      if (!drive) return
      const score = await currentScore(db, drive)
      for (const w of watch.watchers) {
        w.send("status", statusBody(drive))
        w.send("score", score)
      }
    })().catch((error) => console.error("[straightaway] live score failed", error))
  }, wait)
}

function watch(driveId: string, watcher: Watcher) {
  const h = hub()
  let w = h.watches.get(driveId)
  if (!w) {
    w = { shopId: watcher.shopId, watchers: new Set(), scoreTimer: null, lastScoreAt: 0 }
    h.watches.set(driveId, w)
  }
  w.watchers.add(watcher)
  return () => {
    w.watchers.delete(watcher)
    if (w.watchers.size === 0 && h.watches.get(driveId) === w) {
      if (w.scoreTimer) clearTimeout(w.scoreTimer)
      h.watches.delete(driveId)
    }
  }
}

/** The polling answer: events after `after`, the status and the score now. */
export async function livePoll(db: Db, drive: Drive, after: number) {
  await ensureListening()
  const [events, lastEventId, score] = await Promise.all([
    listDriveEventsAfter(db, drive.id, drive.shop_id, after),
    lastDriveEventId(db, drive.id, drive.shop_id),
    currentScore(db, drive),
  ])
  return { lastEventId: Math.max(lastEventId, after), events, status: statusBody(drive), score }
}

/**
 * The Server-Sent Events stream. Without `lastEventId` it opens with a `snapshot` (drive, marks,
 * score); with one it sends the events after it, then the status and score now. Then live `mark`,
 * `unmark`, `status` (with ids) and `score` events, and a `heartbeat` every HEARTBEAT_MS.
 */
export async function liveStream(req: Request, drive: Drive, lastEventId: number | null): Promise<Response> {
  await ensureListening()
  const db = getDb()
  const encoder = new TextEncoder()
  let stop = () => {}
  const stream = new ReadableStream<Uint8Array>({
    start: async (controller) => {
      let open = true
      const write = (text: string) => {
        if (!open) return
        try {
          controller.enqueue(encoder.encode(text))
        } catch {
          stop()
        }
      }
      const send = (event: string, data: unknown, id?: number) =>
        write(`${id === undefined ? "" : `id: ${id}\n`}event: ${event}\ndata: ${JSON.stringify(data)}\n\n`)
      // Live events are held back until the first answer is written, so none comes before it.
      let held: Array<[string, unknown, number | undefined]> | null = []
      const watcher: Watcher = {
        shopId: drive.shop_id,
        send: (event, data, id) => (held ? held.push([event, data, id]) : send(event, data, id)),
        close: () => stop(),
      }
      const unwatch = watch(drive.id, watcher)
      const heartbeat = setInterval(() => send("heartbeat", { at: Date.now() }), HEARTBEAT_MS)
      stop = () => {
        if (!open) return
        open = false
        clearInterval(heartbeat)
        unwatch()
        try {
          controller.close()
        } catch {}
      }
      req.signal.addEventListener("abort", () => stop())
      write(`retry: ${RETRY_MS}\n\n`)
      try {
        if (lastEventId === null) {
          const snap = await snapshot(db, drive)
          send("snapshot", snap, snap.lastEventId)
        } else {
          const events = await listDriveEventsAfter(db, drive.id, drive.shop_id, lastEventId)
          for (const e of events) send(e.kind, e.body, e.id)
          send("status", statusBody(drive))
          send("score", await currentScore(db, drive))
        }
      } catch (error) {
        console.error("[straightaway] live stream failed", error)
        stop()
        return
      }
      const waiting = held
      held = null
      for (const [event, data, id] of waiting) send(event, data, id)
    },
    cancel: () => stop(),
  })
  return new Response(stream, {
    headers: {
      "content-type": "text/event-stream; charset=utf-8",
      // no-transform: the server's gzip leaves the stream alone (it would hold events back)
      "cache-control": "no-cache, no-transform",
      connection: "keep-alive",
      "x-accel-buffering": "no",
    },
  })
}
