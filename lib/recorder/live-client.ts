// The browser end of a drive's live channel (GET /api/drives/:id/live): Server-Sent Events through the
// built-in EventSource, resumed from the last event id, and polling with `?after=` where a stream cannot
// stay open (no EventSource, or the stream keeps failing). No imports: it rides in the recorder's lazy chunk.
import type { ApiMark } from "@/lib/drive-file/schema"
import type { Score } from "@/lib/scoring/types"

export type LiveMark = ApiMark & { seq?: number }

interface LiveStatus {
  status: "recording" | "finished"
  verdict: string | null
  reviewStatus: string | null
  finishedAt: string | null
}

interface LiveSnapshot {
  lastEventId: number
  drive: LiveStatus & { id: string; roNumber: string | null; vehicleDescription: string | null; createdAt: string }
  marks: LiveMark[]
  score: Score
}

/** How the phone hears the drive: a live stream, polling, or nothing (offline: it shows what it holds). */
export type LiveConnection = "connecting" | "live" | "polling" | "offline"

export interface LiveHandlers {
  snapshot(s: LiveSnapshot): void
  mark(m: LiveMark): void
  unmark(id: string): void
  status(s: LiveStatus): void
  score(s: Score): void
  connection(state: LiveConnection, lastContactAt: number | null): void
}

export interface LiveOptions {
  /** Where to resume from (a phone that held the drive before). */
  lastEventId?: number | null
  pollMs?: number
  /** Without a word from the server for this long, the phone says it is offline. */
  silentMs?: number
  EventSourceImpl?: typeof EventSource | null
  fetchImpl?: typeof fetch
  onEventId?: (id: number) => void
}

export function connectLive(driveId: string, h: LiveHandlers, options: LiveOptions = {}) {
  const pollMs = options.pollMs ?? 3000
  const silentMs = options.silentMs ?? 25_000
  const ES =
    options.EventSourceImpl === undefined
      ? typeof EventSource === "undefined"
        ? null
        : EventSource
      : options.EventSourceImpl
  const doFetch = options.fetchImpl ?? ((...a: Parameters<typeof fetch>) => fetch(...a))
  const base = `/api/drives/${encodeURIComponent(driveId)}/live`
  let lastEventId: number | null = options.lastEventId ?? null
  let source: EventSource | null = null
  let pollTimer: ReturnType<typeof setTimeout> | null = null
  let watchdog: ReturnType<typeof setInterval> | null = null
  let lastContactAt: number | null = null
  let state: LiveConnection = "connecting"
  let streamFailures = 0
  let closed = false

  const setState = (next: LiveConnection) => {
    if (next !== state) {
      state = next
      h.connection(state, lastContactAt)
    }
  }
  const contact = (via: "live" | "polling") => {
    lastContactAt = Date.now()
    setState(via)
    h.connection(state, lastContactAt)
  }
  const browserOffline = () => typeof navigator !== "undefined" && navigator.onLine === false
  const noteId = (id: number | null | undefined) => {
    if (id === null || id === undefined || !Number.isFinite(id)) return
    if (lastEventId === null || id > lastEventId) {
      lastEventId = id
      options.onEventId?.(id)
    }
  }

  function apply(kind: string, data: unknown) {
    if (kind === "snapshot") h.snapshot(data as LiveSnapshot)
    else if (kind === "mark") h.mark(data as LiveMark)
    else if (kind === "unmark") h.unmark((data as { id: string }).id)
    else if (kind === "status") h.status(data as LiveStatus)
    else if (kind === "score") h.score(data as Score)
  }

  function openStream(): void {
    if (closed) return
    if (!ES) return void poll()
    source?.close()
    // A new EventSource cannot send Last-Event-ID itself the first time: the query carries it.
    const url = lastEventId === null ? base : `${base}?lastEventId=${lastEventId}`
    const es = new ES(url, { withCredentials: true })
    source = es
    for (const kind of ["snapshot", "mark", "unmark", "status", "score", "heartbeat"]) {
      es.addEventListener(kind, (e) => {
        if (source !== es) return // a stream this phone has let go of (offline, or reopened) speaks no more
        const me = e as MessageEvent<string>
        streamFailures = 0
        contact("live")
        if (me.lastEventId) noteId(Number(me.lastEventId))
        if (kind === "snapshot") noteId((JSON.parse(me.data) as LiveSnapshot).lastEventId)
        apply(kind, JSON.parse(me.data))
      })
    }
    es.onerror = () => {
      if (source !== es) return
      streamFailures++
      // CLOSED: the server refused (401/404) or the stream cannot stay open here: poll instead.
      if (es.readyState === 2 || streamFailures >= 3) {
        es.close()
        source = null
        void poll()
      } else if (browserOffline()) setState("offline")
    }
  }

  async function poll(): Promise<void> {
    if (closed) return
    if (pollTimer) clearTimeout(pollTimer)
    pollTimer = null
    // The browser says there is no network: nothing to ask until it says otherwise (its online event reconnects; the
    // next poll looks again in case that event never comes).
    if (browserOffline()) {
      setState("offline")
      pollTimer = setTimeout(() => void poll(), pollMs)
      return
    }
    try {
      const res = await doFetch(`${base}?after=${lastEventId ?? 0}`, { cache: "no-store" })
      if (res.ok) {
        const body = (await res.json()) as {
          lastEventId: number
          events: Array<{ id: number; kind: string; body: unknown }>
          status: LiveStatus
          score: Score
        }
        for (const e of body.events) apply(e.kind, e.body)
        noteId(body.lastEventId)
        h.status(body.status)
        h.score(body.score)
        contact("polling")
        // The stream may work again (the network came back): try it now and then.
        if (ES && streamFailures < 6) {
          streamFailures += 2
          return openStream()
        }
      } else if (state !== "offline" && lastContactAt === null) setState("connecting")
    } catch {
      setState("offline")
    }
    if (!closed) pollTimer = setTimeout(() => void poll(), pollMs)
  }

  watchdog = setInterval(() => {
    if (lastContactAt !== null && Date.now() - lastContactAt > silentMs) setState("offline")
  }, 1000)

  openStream()

  return {
    /** The network is back: open the stream again now, from the last event id. */
    reconnect() {
      if (closed) return
      if (pollTimer) clearTimeout(pollTimer)
      pollTimer = null
      streamFailures = 0
      openStream()
    },
    /**
     * The network went away: say so at once, and let go of the stream (it notices on its own only later, and what it
     * still delivers must not say the phone is live). Polling looks for the network again until the online event.
     */
    offline() {
      if (closed) return
      source?.close()
      source = null
      setState("offline")
      void poll()
    },
    get lastEventId() {
      return lastEventId
    },
    close() {
      closed = true
      source?.close()
      source = null
      if (pollTimer) clearTimeout(pollTimer)
      if (watchdog) clearInterval(watchdog)
    },
  }
}

export type LiveLink = ReturnType<typeof connectLive>
