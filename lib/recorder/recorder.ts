// The recorder's client state: one zustand (vanilla) store and the machinery behind it — geolocation,
// the live scorer, IndexedDB pieces every second, the outbox and its flushes, the screen wake lock.
// Browser-only; the decisions it makes live in the pure modules beside it.
import { createStore } from "zustand/vanilla"
import type { ApiMark, MarkKind, Sample } from "@/lib/drive-file/schema"
import type { ResolvedProfile } from "@/lib/drive-file/profile"
import { createLiveScorer, type LiveScorer } from "@/lib/scoring/score"
import { geodesicDistanceM } from "@/lib/scoring/geodesy"
import { predictMinutesLeft, type MinutesLeft } from "@/lib/scoring/predict"
import type { Score } from "@/lib/scoring/types"
import type { UnitSystem } from "@/lib/format"
import { BATCH_ID_HEADER, PERSIST_EVERY_MS, shouldPersist, shouldSend } from "./batching"
import {
  getLastSynced,
  idbOutbox,
  loadMarks,
  loadRemoteMarks,
  loadMeta,
  loadSamples,
  persistSamples,
  saveMarks,
  saveMeta,
  saveOutboxItems,
  saveRemoteMarks,
  setActiveDrive,
  setLastSynced,
  type DriveMeta,
} from "./idb-outbox"
import { connectLive, type LiveConnection, type LiveLink, type LiveMark } from "./live-client"
import { flushOutbox, makeItem, type OutboxItem, type Transport } from "./outbox"
import { positionToSample, type GpsState } from "./position"

type SyncState = "idle" | "sending" | "waiting" | "signed-out"

export interface RecorderState {
  meta: DriveMeta | null
  sampleCount: number
  lastSample: Sample | null
  /** The device's speed, else distance over time from the fix before. */
  speedMps: number | null
  score: Score | null
  minutesLeft: MinutesLeft | null
  nowMs: number
  gps: GpsState
  accuracyM: number | null
  /** Marks logged on this phone (what undo takes back). */
  marks: ApiMark[]
  /** Marks other phones logged, as the live channel brought them. */
  remoteMarks: ApiMark[]
  /** Every mark this phone knows, by time: what the meters score with and the buttons follow. */
  knownMarks: ApiMark[]
  /** The live channel: how this phone hears the drive, and when it last heard from the server. */
  live: { state: LiveConnection; lastContactAt: number | null }
  /** What the server says of the drive (RO, status), from the live channel. */
  driveInfo: {
    roNumber: string | null
    vehicleDescription: string | null
    status: "recording" | "finished"
    finishedAt: string | null
  } | null
  /** When the server's live score shown on a phone without samples (the co-driver's own) was computed. */
  scoreAsOf: number | null
  sync: {
    state: SyncState
    waitingSamples: number
    waitingOther: number
    failed: OutboxItem[]
    lastSyncedAt: number | null
    retryAtMs: number | null
  }
  serverScore: Score | null
}

const NO_FIX_AFTER_MS = 15_000

export const fetchTransport: Transport = {
  async request(method, path, body) {
    // A sample batch names itself in a header too, so a batch the server holds already is answered before its body
    // is read (app/api/drives/[driveId]/samples/route.ts).
    const batchId = (body as { batchId?: string } | undefined)?.batchId
    const headers: Record<string, string> = body === undefined ? {} : { "content-type": "application/json" }
    if (batchId) headers[BATCH_ID_HEADER] = batchId
    // fetch sends the session cookie to its own origin by default (credentials "same-origin").
    const res = await fetch(path, {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
      cache: "no-store",
    })
    const text = await res.text()
    let parsed: unknown = null
    try {
      parsed = text ? JSON.parse(text) : null
    } catch {}
    return { status: res.status, body: parsed }
  },
}

/** What the start screen hands the recorder: the conditions the drive is held to and what it is for. */
export interface DriveStart {
  profile: ResolvedProfile
  label: string
  vehicleDescription: string | null
  jobId: string | null
  taskId: string | null
  coDriverId: string | null
}

export function createRecorder(transport: Transport = fetchTransport) {
  const store = createStore<RecorderState>(() => ({
    meta: null,
    sampleCount: 0,
    lastSample: null,
    speedMps: null,
    score: null,
    minutesLeft: null,
    nowMs: Date.now(),
    gps: "waiting",
    accuracyM: null,
    marks: [],
    remoteMarks: [],
    knownMarks: [],
    live: { state: "connecting", lastContactAt: null },
    driveInfo: null,
    scoreAsOf: null,
    sync: { state: "idle", waitingSamples: 0, waitingOther: 0, failed: [], lastSyncedAt: null, retryAtMs: null },
    serverScore: null,
  }))

  let scorer: LiveScorer | null = null
  let buffer: Sample[] = []
  let bufferSince: number | null = null
  // Stored but not yet handed to flush(): sent every 5 s or 50 samples (lib/recorder/batching.ts).
  let unsent = 0
  let unsentSince: number | null = null
  let seq = 0
  let watchId: number | null = null
  let ticker: ReturnType<typeof setInterval> | null = null
  let retryTimer: ReturnType<typeof setTimeout> | null = null
  let lastFixAt = 0
  let flushing: Promise<void> | null = null
  let wakeLock: { release(): Promise<void> } | null = null
  let lastT = -1
  let live: LiveLink | null = null
  /** Ids of remote marks the scorer holds. */
  let scoredRemote = new Set<string>()

  function rescore() {
    const meta = store.getState().meta
    if (!scorer || !meta) return
    const elapsedSeconds = (Date.now() - meta.startedAtMs) / 1000
    // A co-driver's own phone holds no samples: its meters show the server's live score.
    const score = meta.role === "co-driver" ? store.getState().score : scorer.score()
    const minutesLeft = score ? predictMinutesLeft(score, meta.profile, { elapsedSeconds }) : null
    store.setState({ score, minutesLeft, nowMs: Date.now() })
  }

  function byTime(list: ApiMark[]): ApiMark[] {
    return list
      .map((m, i) => [m, i] as const)
      .sort((a, b) => a[0].t - b[0].t || a[1] - b[1])
      .map(([m]) => m)
  }

  function setMarks(next: { marks?: ApiMark[]; remoteMarks?: ApiMark[] }) {
    const s = store.getState()
    const marks = next.marks ?? s.marks
    const remoteMarks = next.remoteMarks ?? s.remoteMarks
    store.setState({ marks, remoteMarks, knownMarks: byTime([...marks, ...remoteMarks]) })
  }

  /** The live scorer has no removal: build it again from what this phone holds. */
  async function rebuildScorer() {
    const meta = store.getState().meta
    if (!meta) return
    const { samples } = await loadSamples(meta.id)
    scorer = createLiveScorer(meta.profile)
    scorer.addSamples([...samples, ...buffer])
    scorer.addMarks(byTime([...store.getState().marks, ...store.getState().remoteMarks]))
    scoredRemote = new Set(store.getState().remoteMarks.map((m) => m.id))
  }

  const plainMark = ({ seq: _seq, ...m }: LiveMark): ApiMark => m

  function saveRemote() {
    const meta = store.getState().meta
    if (meta)
      void saveRemoteMarks(meta.id, { marks: store.getState().remoteMarks, lastEventId: live?.lastEventId ?? null })
  }

  /** Marks from the server: the ones this phone does not hold yet join, once each (reconciled by id). */
  function receiveMarks(incoming: LiveMark[], replaceAll: boolean) {
    const s = store.getState()
    const own = new Set(s.marks.map((m) => m.id))
    const fresh = incoming.filter((m) => !own.has(m.id)).map(plainMark)
    let remote: ApiMark[]
    if (replaceAll) remote = fresh
    else {
      const have = new Set(s.remoteMarks.map((m) => m.id))
      remote = [...s.remoteMarks, ...fresh.filter((m) => !have.has(m.id))]
    }
    const dropped = [...scoredRemote].some((id) => !remote.some((m) => m.id === id))
    setMarks({ remoteMarks: remote })
    if (dropped) {
      void rebuildScorer().then(rescore)
    } else {
      const add = remote.filter((m) => !scoredRemote.has(m.id))
      if (add.length) {
        scorer?.addMarks(add)
        for (const m of add) scoredRemote.add(m.id)
        rescore()
      }
    }
    saveRemote()
  }

  function startLive(meta: DriveMeta, lastEventId: number | null) {
    live?.close()
    live = connectLive(
      meta.id,
      {
        snapshot: (snap) => {
          const current = store.getState().meta
          store.setState({
            driveInfo: {
              roNumber: snap.drive.roNumber,
              vehicleDescription: snap.drive.vehicleDescription,
              status: snap.drive.status,
              finishedAt: snap.drive.finishedAt,
            },
          })
          if (current?.role === "co-driver") {
            const startedAtMs = Date.parse(snap.drive.createdAt)
            if (Number.isFinite(startedAtMs) && startedAtMs !== current.startedAtMs) {
              const next = { ...current, startedAtMs }
              void saveMeta(next)
              store.setState({ meta: next })
            }
            store.setState({ score: snap.score, scoreAsOf: Date.now() })
          }
          receiveMarks(snap.marks, true)
        },
        mark: (m) => receiveMarks([m], false),
        unmark: (id) => {
          const s = store.getState()
          if (s.remoteMarks.some((m) => m.id === id)) {
            setMarks({ remoteMarks: s.remoteMarks.filter((m) => m.id !== id) })
            void rebuildScorer().then(rescore)
            saveRemote()
          }
        },
        status: (st) => {
          const info = store.getState().driveInfo
          store.setState({
            driveInfo: {
              roNumber: info?.roNumber ?? null,
              vehicleDescription: info?.vehicleDescription ?? null,
              status: st.status,
              finishedAt: st.finishedAt,
            },
          })
        },
        score: (score) => {
          if (store.getState().meta?.role === "co-driver") {
            store.setState({ score, scoreAsOf: Date.now() })
            rescore()
          }
        },
        connection: (state, lastContactAt) => store.setState({ live: { state, lastContactAt } }),
      },
      { lastEventId, onEventId: () => saveRemote() },
    )
  }

  /** The network came back: send what waits and hear the drive again from where the phone left off. */
  async function online() {
    live?.reconnect()
    await flushNow()
  }

  function offline() {
    live?.offline()
  }

  async function refreshSyncCounts() {
    const items = await idbOutbox.list()
    let waitingSamples = 0
    let waitingOther = 0
    const failed: OutboxItem[] = []
    for (const i of items) {
      if (i.failed) failed.push(i)
      else if (i.type === "samples") waitingSamples += i.samples.length
      else waitingOther += 1
    }
    store.setState((s) => ({
      sync: { ...s.sync, waitingSamples: waitingSamples + buffer.length, waitingOther, failed },
    }))
  }

  async function persistBuffer(force = false) {
    const meta = store.getState().meta
    if (!meta || buffer.length === 0) return
    if (!force && !shouldPersist(buffer.length, bufferSince, Date.now())) return
    const piece = buffer
    unsentSince ??= bufferSince
    buffer = []
    bufferSince = null
    const batchId = `${meta.id.slice(0, 8)}-${String(seq).padStart(6, "0")}-${crypto.randomUUID().slice(0, 8)}`
    const item = makeItem(meta.id, { type: "samples", batchId, samples: piece }, Date.now())
    await persistSamples(meta.id, seq++, piece, item)
    unsent += piece.length
    void refreshSyncCounts()
    sendWhenDue(force)
  }

  /** Hands the stored samples to flush() every SEND_EVERY_MS or SEND_AT_SAMPLES, or at once when `now`. */
  function sendWhenDue(now = false) {
    if (!now && !shouldSend(unsent, unsentSince, Date.now())) return
    unsent = 0
    unsentSince = null
    void flush()
  }

  function onPosition(p: GeolocationPosition) {
    const meta = store.getState().meta
    if (!meta || meta.status !== "recording") return
    const sample = positionToSample(p)
    lastFixAt = Date.now()
    const prev = store.getState().lastSample
    const speedMps =
      sample.speed ??
      (prev && sample.t > prev.t
        ? geodesicDistanceM(prev.lat, prev.lon, sample.lat, sample.lon) / ((sample.t - prev.t) / 1000)
        : null)
    store.setState({ speedMps })
    const poor =
      sample.accuracy !== null && sample.accuracy !== undefined && sample.accuracy > meta.profile.maxAccuracyM
    store.setState({ gps: poor ? "poor" : "ok", accuracyM: sample.accuracy ?? null })
    if (meta.role === "co-driver") {
      store.setState({ lastSample: sample })
      return
    }
    if (sample.t <= lastT) return // a repeated fix: the drive already has this moment
    lastT = sample.t
    buffer.push(sample)
    bufferSince ??= Date.now()
    scorer?.addSamples([sample])
    store.setState((s) => ({ sampleCount: s.sampleCount + 1, lastSample: sample }))
    rescore()
    void persistBuffer()
  }

  function onPositionError(e: GeolocationPositionError) {
    if (e.code === e.PERMISSION_DENIED) store.setState({ gps: "denied" })
    else if (e.code === e.POSITION_UNAVAILABLE) store.setState({ gps: "no-fix" })
  }

  function startWatching() {
    if (watchId !== null) return
    if (!("geolocation" in navigator)) {
      store.setState({ gps: "unavailable" })
      return
    }
    watchId = navigator.geolocation.watchPosition(onPosition, onPositionError, {
      enableHighAccuracy: true,
      maximumAge: 0,
      timeout: 30_000,
    })
    lastFixAt = Date.now()
    ticker = setInterval(() => {
      void persistBuffer()
      sendWhenDue()
      const s = store.getState()
      if (s.gps !== "denied" && s.gps !== "unavailable" && Date.now() - lastFixAt > NO_FIX_AFTER_MS)
        store.setState({ gps: "no-fix" })
      rescore()
    }, PERSIST_EVERY_MS)
    void keepScreenOn()
    document.addEventListener("visibilitychange", onVisibility)
  }

  function stopWatching() {
    if (watchId !== null) navigator.geolocation.clearWatch(watchId)
    watchId = null
    if (ticker) clearInterval(ticker)
    ticker = null
    document.removeEventListener("visibilitychange", onVisibility)
    void wakeLock?.release().catch(() => {})
    wakeLock = null
  }

  async function keepScreenOn() {
    const nav = navigator as Navigator & {
      wakeLock?: { request(type: "screen"): Promise<{ release(): Promise<void> }> }
    }
    try {
      wakeLock = (await nav.wakeLock?.request("screen")) ?? null
    } catch {
      wakeLock = null // refused (battery saver, page hidden): recording goes on, the screen may dim
    }
  }

  function onVisibility() {
    if (document.visibilityState === "visible") void keepScreenOn()
    else void persistBuffer(true) // the app may be killed in the background: keep every fix
  }

  async function flush(): Promise<void> {
    if (flushing) return flushing
    flushing = (async () => {
      store.setState((s) => ({ sync: { ...s.sync, state: "sending" } }))
      const outcome = await flushOutbox(idbOutbox, transport, {
        onSent: (items, body) => {
          const at = Date.now()
          void setLastSynced(at)
          store.setState((s) => ({ sync: { ...s.sync, lastSyncedAt: at } }))
          const finish = items.find((i) => i.type === "finish")
          if (finish) void onFinished(finish.driveId, body as { score?: Score })
        },
      })
      if (retryTimer) clearTimeout(retryTimer)
      retryTimer = null
      if (outcome.kind === "offline") {
        retryTimer = setTimeout(() => void flush(), Math.max(250, outcome.retryAtMs - Date.now()))
      }
      const state: SyncState =
        outcome.kind === "done" ? "idle" : outcome.kind === "signed-out" ? "signed-out" : "waiting"
      store.setState((s) => ({
        sync: { ...s.sync, state, retryAtMs: outcome.kind === "offline" ? outcome.retryAtMs : null },
      }))
      await refreshSyncCounts()
    })().finally(() => {
      flushing = null
    })
    return flushing
  }

  /** Retry now, also items put on hold by backoff (the network came back). */
  async function flushNow() {
    const items = await idbOutbox.list()
    const held = items.filter((i) => !i.failed && i.notBeforeMs > 0).map((i) => ({ ...i, notBeforeMs: 0 }))
    if (held.length) await saveOutboxItems(held)
    await flush()
  }

  async function onFinished(driveId: string, body: { score?: Score }) {
    const meta = store.getState().meta
    if (!meta || meta.id !== driveId) return
    const next: DriveMeta = { ...meta, status: "finished", finishedScore: body.score, finishedLocally: false }
    await saveMeta(next)
    store.setState({ meta: next, serverScore: body.score ?? null })
  }

  async function load(driveId: string): Promise<boolean> {
    const meta = await loadMeta(driveId)
    if (!meta) return false
    const [{ samples, nextSeq }, marks, lastSyncedAt, remote] = await Promise.all([
      loadSamples(driveId),
      loadMarks(driveId),
      getLastSynced(),
      loadRemoteMarks(driveId),
    ])
    seq = nextSeq
    scorer = createLiveScorer(meta.profile)
    scorer.addSamples(samples)
    scorer.addMarks(byTime([...marks, ...remote.marks]))
    scoredRemote = new Set(remote.marks.map((m) => m.id))
    lastT = samples.reduce((m, s) => Math.max(m, s.t), -1)
    store.setState((s) => ({
      meta,
      marks,
      remoteMarks: remote.marks,
      knownMarks: byTime([...marks, ...remote.marks]),
      sampleCount: samples.length,
      lastSample: samples.at(-1) ?? null,
      serverScore: meta.finishedScore ?? null,
      sync: { ...s.sync, lastSyncedAt: lastSyncedAt ?? null },
    }))
    rescore()
    if (meta.status === "recording") startWatching()
    // A fresh snapshot on every load (the RO and status come with it); the stream resumes by event id after that.
    startLive(meta, null)
    void refreshSyncCounts()
    void flush()
    return true
  }

  /** A second phone attached as co-driver: marks only, speed from its own position for the gap counter. */
  async function joinAsCoDriver(driveId: string, profile: ResolvedProfile, label: string, units?: UnitSystem) {
    const existing = await loadMeta(driveId)
    if (!existing) {
      await saveMeta({
        id: driveId,
        profile,
        startedAtMs: Date.now(),
        vehicleDescription: null,
        jobId: null,
        taskId: null,
        label,
        status: "recording",
        role: "co-driver",
        ...(units ? { units } : {}),
      })
      await saveMarks(driveId, [])
    }
    return load(driveId)
  }

  async function start(input: DriveStart & { id: string; units?: UnitSystem }) {
    const meta: DriveMeta = {
      id: input.id,
      profile: input.profile,
      startedAtMs: Date.now(),
      vehicleDescription: input.vehicleDescription,
      jobId: input.jobId,
      taskId: input.taskId,
      label: input.label,
      status: "recording",
      ...(input.units ? { units: input.units } : {}),
    }
    const create = makeItem(
      input.id,
      {
        type: "create-drive",
        body: {
          ...(input.jobId ? { jobId: input.jobId } : {}),
          ...(input.taskId ? { taskId: input.taskId } : {}),
          ...(input.vehicleDescription ? { vehicleDescription: input.vehicleDescription } : {}),
          ...(input.coDriverId ? { coDriverId: input.coDriverId } : {}),
          profile: input.profile,
        },
      },
      Date.now(),
    )
    await saveMeta(meta)
    await saveMarks(input.id, [])
    await saveOutboxItems([create])
    await setActiveDrive(input.id)
    return load(input.id)
  }

  /** After this phone's marks changed and the scorer holds them: rescore, refresh the counts, send the outbox. */
  function marksChanged() {
    rescore()
    void refreshSyncCounts()
    void flush()
  }

  async function addMark(kind: MarkKind, extra: Partial<Pick<ApiMark, "gapFt" | "text" | "checkKey" | "result">> = {}) {
    const meta = store.getState().meta
    if (!meta) return null
    const mark: ApiMark = { id: crypto.randomUUID(), t: Date.now(), kind, ...extra }
    const marks = [...store.getState().marks, mark]
    await saveMarks(meta.id, marks)
    await saveOutboxItems([makeItem(meta.id, { type: "marks", marks: [mark] }, Date.now())])
    setMarks({ marks })
    scorer?.addMarks([mark])
    marksChanged()
    return mark
  }

  /** Undo the last mark: dropped from the outbox if not sent yet, else deleted on the server. */
  async function undoLastMark() {
    const meta = store.getState().meta
    const marks = store.getState().marks
    const last = marks.at(-1)
    if (!meta || !last) return null
    const rest = marks.slice(0, -1)
    const waiting = (await idbOutbox.list()).find((i) => i.type === "marks" && i.marks.some((m) => m.id === last.id))
    if (waiting) await idbOutbox.remove([waiting.key])
    else await saveOutboxItems([makeItem(meta.id, { type: "delete-mark", markId: last.id }, Date.now())])
    await saveMarks(meta.id, rest)
    setMarks({ marks: rest })
    await rebuildScorer()
    marksChanged()
    return last
  }

  async function finish() {
    const meta = store.getState().meta
    if (!meta) return
    stopWatching()
    await persistBuffer(true)
    const next: DriveMeta = { ...meta, status: "finishing", finishedLocally: true }
    await saveMeta(next)
    await saveOutboxItems([makeItem(meta.id, { type: "finish" }, Date.now())])
    await setActiveDrive(null)
    store.setState({ meta: next })
    rescore()
    await flushNow()
  }

  async function retryFailed(key: string) {
    const item = (await idbOutbox.list()).find((i) => i.key === key)
    if (!item) return
    const { failed: _f, ...rest } = item
    await saveOutboxItems([{ ...rest, attempts: 0, notBeforeMs: 0 }])
    await flush()
  }

  function dispose() {
    stopWatching()
    live?.close()
    live = null
    if (retryTimer) clearTimeout(retryTimer)
    void persistBuffer(true)
  }

  return {
    store,
    load,
    start,
    joinAsCoDriver,
    addMark,
    undoLastMark,
    finish,
    flush,
    flushNow,
    retryFailed,
    dispose,
    persistBuffer,
    online,
    offline,
  }
}

export type Recorder = ReturnType<typeof createRecorder>
