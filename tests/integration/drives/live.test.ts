import { randomUUID } from "node:crypto"
import { afterEach, beforeAll, describe, expect, it } from "vitest"
import { loadDriveFile } from "@/db/queries/drive-file"
import { internalDriveId } from "@/lib/drive-id"
import type { ApiMark, Sample } from "@/lib/drive-file"
import { createRng, generateDrive } from "@/lib/tracks"
import { scoreDrive } from "@/lib/scoring"
import { createTestShop, testDb, type TestShop } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { ApiClient, signedIn } from "../../helpers/http"
import { setUpShopTeam } from "../../helpers/team"
import { sampleRun, startDrive } from "./helpers"

interface SseEvent {
  id?: string
  event: string
  data: any
}

/** An open Server-Sent Events stream read the way EventSource reads one (fields, blank line ends an event). */
class Stream {
  private buffer = ""
  private queue: SseEvent[] = []
  private waiters: Array<() => void> = []
  private reader: ReadableStreamDefaultReader<Uint8Array>
  private abort = new AbortController()
  status = 0
  contentType = ""

  static async open(client: ApiClient, path: string, headers: Record<string, string> = {}) {
    const s = new Stream()
    const res = await fetch(`${testEnv().baseUrl}${path}`, {
      headers: {
        cookie: client.cookie ?? "",
        "x-forwarded-for": client.address,
        accept: "text/event-stream",
        ...headers,
      },
      signal: s.abort.signal,
    })
    s.status = res.status
    s.contentType = res.headers.get("content-type") ?? ""
    s.reader = res.body!.getReader()
    void s.pump()
    return s
  }

  private constructor() {
    this.reader = undefined as never
  }

  private async pump() {
    const decoder = new TextDecoder()
    try {
      for (;;) {
        const { value, done } = await this.reader.read()
        if (done) break
        this.buffer += decoder.decode(value, { stream: true })
        let cut: number
        while ((cut = this.buffer.indexOf("\n\n")) >= 0) {
          const block = this.buffer.slice(0, cut)
          this.buffer = this.buffer.slice(cut + 2)
          const e: Partial<SseEvent> & { lines: string[] } = { lines: [] }
          for (const line of block.split("\n")) {
            if (line.startsWith(":")) continue
            const i = line.indexOf(":")
            const field = i < 0 ? line : line.slice(0, i)
            const value = i < 0 ? "" : line.slice(i + 1).replace(/^ /, "")
            if (field === "id") e.id = value
            else if (field === "event") e.event = value
            else if (field === "data") e.lines.push(value)
          }
          if (e.lines.length === 0) continue // the retry: line
          this.queue.push({ id: e.id, event: e.event ?? "message", data: JSON.parse(e.lines.join("\n")) })
          for (const w of this.waiters.splice(0)) w()
        }
      }
    } catch {
      // closed by the test
    }
  }

  /** The next event matching `pred` (earlier ones are skipped); fails after `ms`. */
  async next(pred: (e: SseEvent) => boolean = () => true, ms = 8000): Promise<SseEvent> {
    const deadline = Date.now() + ms
    for (;;) {
      const i = this.queue.findIndex(pred)
      if (i >= 0) return this.queue.splice(0, i + 1).at(-1)!
      this.queue.length = 0
      const left = deadline - Date.now()
      if (left <= 0) throw new Error("no matching event on the live stream")
      await new Promise<void>((resolve) => {
        const timer = setTimeout(resolve, left)
        this.waiters.push(() => {
          clearTimeout(timer)
          resolve()
        })
      })
    }
  }

  close() {
    this.abort.abort()
  }
}

const mark = (t: number, kind: ApiMark["kind"], extra: Partial<ApiMark> = {}): ApiMark => ({
  id: randomUUID(),
  t,
  kind,
  ...extra,
})

describe("GET /api/drives/:id/live", () => {
  const team = setUpShopTeam("Live")
  let other: TestShop
  const open: Stream[] = []
  beforeAll(async () => {
    other = await createTestShop("Live other")
  })
  afterEach(() => {
    for (const s of open.splice(0)) s.close()
  })
  const stream = async (client: ApiClient, path: string, headers?: Record<string, string>) => {
    const s = await Stream.open(client, path, headers)
    open.push(s)
    return s
  }

  it("refuses a visitor with 401 and another shop's user with 404, in the error shape", async () => {
    const drive = await startDrive(team.tech)
    const anon = await new ApiClient().get(`/api/drives/${drive.id}/live?after=0`)
    expect(anon.status).toBe(401)
    expect(anon.body.error.code).toBe("not_signed_in")
    const outsider = await signedIn(other.lead)
    const res = await outsider.get(`/api/drives/${drive.id}/live?after=0`)
    expect(res.status).toBe(404)
    expect(res.body.error).toMatchObject({ code: "not_found" })
    const sse = await stream(outsider, `/api/drives/${drive.id}/live`)
    expect(sse.status).toBe(404)
    expect((await outsider.get(`/api/drives/not-a-uuid/live`)).status).toBe(404)
  })

  it("opens with a snapshot, then sends a mark stored from another phone with its event id", async () => {
    const drive = await startDrive(team.tech, { coDriverId: team.shop.codriver.id })
    const samples = sampleRun(30)
    await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "b1", samples })
    const first = mark(samples[5]!.t, "lead-on", { gapFt: 150 })
    await team.codriver.post(`/api/drives/${drive.id}/marks`, { marks: [first] })

    const s = await stream(team.tech, `/api/drives/${drive.id}/live`)
    expect(s.status).toBe(200)
    expect(s.contentType).toContain("text/event-stream")
    const snap = await s.next((e) => e.event === "snapshot")
    expect(snap.data.marks.map((m: ApiMark) => m.id)).toEqual([first.id])
    expect(snap.data.drive).toMatchObject({
      id: drive.id,
      status: "recording",
      vehicleDescription: "2019 Invented Corvan, white",
    })
    expect(snap.data.score.samplesUsed).toBe(30)
    expect(Number(snap.id)).toBe(snap.data.lastEventId)

    const second = mark(samples[20]!.t, "cleared")
    expect((await team.codriver.post(`/api/drives/${drive.id}/marks`, { marks: [second] })).status).toBe(200)
    const got = await s.next((e) => e.event === "mark")
    expect(got.data).toMatchObject({ id: second.id, t: second.t, kind: "cleared" })
    expect(Number(got.id)).toBeGreaterThan(snap.data.lastEventId)
    const score = await s.next((e) => e.event === "score" && e.data.clearedAtSeconds !== null)
    expect(score.data.clearedAtSeconds).toBeCloseTo((second.t - samples[0]!.t) / 1000, 6)

    // A replayed mark (same id) is stored once and announced once.
    await team.codriver.post(`/api/drives/${drive.id}/marks`, { marks: [second] })
    const undo = await team.tech.delete(`/api/drives/${drive.id}/marks/${first.id}`)
    expect(undo.status).toBe(204)
    const gone = await s.next((e) => e.event === "mark" || e.event === "unmark")
    expect(gone).toMatchObject({ event: "unmark", data: { id: first.id } })
  })

  it("resumes after Last-Event-ID with what the screen missed, then the status and score now", async () => {
    const drive = await startDrive(team.tech, { coDriverId: team.shop.codriver.id })
    const samples = sampleRun(20)
    await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "b1", samples })
    const s1 = await stream(team.codriver, `/api/drives/${drive.id}/live`)
    const snap = await s1.next((e) => e.event === "snapshot")
    s1.close()
    const missed = [mark(samples[3]!.t, "lead-on"), mark(samples[9]!.t, "gap", { gapFt: 120 })]
    await team.tech.post(`/api/drives/${drive.id}/marks`, { marks: missed })

    const s2 = await stream(team.codriver, `/api/drives/${drive.id}/live`, { "last-event-id": String(snap.id) })
    const a = await s2.next((e) => e.event === "mark")
    const b = await s2.next((e) => e.event === "mark")
    expect([a.data.id, b.data.id]).toEqual(missed.map((m) => m.id))
    expect(Number(b.id)).toBeGreaterThan(Number(a.id))
    const status = await s2.next((e) => e.event === "status")
    expect(status.data.status).toBe("recording")
    const score = await s2.next((e) => e.event === "score")
    expect(score.data.samplesUsed).toBe(20)

    // Finish: every open screen hears the status change.
    const finish = await team.tech.post(`/api/drives/${drive.id}/finish`)
    expect(finish.status).toBe(200)
    const finished = await s2.next((e) => e.event === "status" && e.data.status === "finished" && e.id !== undefined)
    expect(finished.data.verdict).toBe(finish.body.score.verdict)
    const last = await s2.next((e) => e.event === "score")
    expect(last.data.verdict).toBe(finish.body.score.verdict)
  })

  it("answers the polling fallback in JSON: events after an id, the status and the score", async () => {
    const drive = await startDrive(team.tech, { coDriverId: team.shop.codriver.id })
    const samples = sampleRun(10)
    await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "b1", samples })
    const start = await team.codriver.get(`/api/drives/${drive.id}/live?after=0`)
    expect(start.status).toBe(200)
    expect(start.body).toMatchObject({ lastEventId: 0, events: [], status: { status: "recording" } })
    expect(start.body.score.samplesUsed).toBe(10)
    const m = mark(samples[2]!.t, "note", { text: "Lead is the grey van" })
    await team.tech.post(`/api/drives/${drive.id}/marks`, { marks: [m] })
    const polled = await team.codriver.get(`/api/drives/${drive.id}/live?after=0`)
    expect(polled.body.events).toHaveLength(1)
    expect(polled.body.events[0]).toMatchObject({
      kind: "mark",
      body: { id: m.id, kind: "note", text: "Lead is the grey van" },
    })
    expect(polled.body.lastEventId).toBe(polled.body.events[0].id)
    const bad = await team.codriver.get(`/api/drives/${drive.id}/live?after=soon`)
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty("after")
    const badResume = await team.codriver.request("GET", `/api/drives/${drive.id}/live`, undefined, {
      headers: { "last-event-id": "x" },
    })
    expect(badResume.status).toBe(400)
  })
})

describe("the server's live score", () => {
  const team = setUpShopTeam("Live score")

  it("equals scoreDrive of the stored data after random batches and marks, late and repeated ones too", async () => {
    const file = generateDrive({ seed: 31, startMs: Date.UTC(2026, 2, 3, 9), hz: 2, minutes: 16, pattern: "met" })
    const rng = createRng(99)
    const drive = await startDrive(team.tech)
    // Read once while empty, so the server holds a live scorer from the start and appends to it.
    expect((await team.tech.get(`/api/drives/${drive.id}`)).status).toBe(200)
    const samples: Sample[] = file.samples.map((s, i) => (i % 97 === 5 ? { ...s, accuracy: 500 } : s))
    const marks: ApiMark[] = file.marks.map((m) => ({ ...m, id: randomUUID() }))
    // Same-millisecond marks: rule 1 keeps their arrival order.
    marks.push(mark(file.samples[200]!.t, "lead-on", { gapFt: 90 }), mark(file.samples[200]!.t, "gap", { gapFt: 400 }))
    let i = 0
    let batch = 0
    const sentMarks: ApiMark[] = []
    while (i < samples.length) {
      const n = 1 + Math.floor(rng() * 120)
      let piece = samples.slice(i, i + n)
      i += n
      if (rng() < 0.25 && i > 400) {
        // late: an older stretch again (duplicates) plus a few never sent before, out of order
        const from = Math.floor(rng() * (i - 300))
        piece = [...samples.slice(from, from + 40), ...piece].reverse()
      }
      const res = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: `b${batch++}`, samples: piece })
      expect(res.status).toBe(200)
      const due = marks.filter((m) => !sentMarks.includes(m) && (m.t <= piece.at(-1)!.t || rng() < 0.05))
      if (due.length) {
        const withRepeat = rng() < 0.5 && sentMarks.length ? [...due, sentMarks[0]!] : due
        expect((await team.tech.post(`/api/drives/${drive.id}/marks`, { marks: withRepeat })).status).toBe(200)
        sentMarks.push(...due)
      }
      if (batch % 5 === 0) await expectEqual(drive.id)
    }
    const rest = marks.filter((m) => !sentMarks.includes(m))
    if (rest.length) await team.tech.post(`/api/drives/${drive.id}/marks`, { marks: rest })
    await expectEqual(drive.id)
    // A mark taken back, then one more mark.
    await team.tech.delete(`/api/drives/${drive.id}/marks/${marks[0]!.id}`)
    await expectEqual(drive.id)
    await team.tech.post(`/api/drives/${drive.id}/marks`, { marks: [mark(file.samples[300]!.t, "verified")] })
    const last = await expectEqual(drive.id)
    expect(last.samplesDroppedForAccuracy).toBeGreaterThan(0)
  })

  async function expectEqual(driveId: string) {
    const expected = scoreDrive(
      await loadDriveFile(testDb(), internalDriveId(team.shop.shopId, driveId), team.shop.shopId),
    )
    const res = await team.tech.get(`/api/drives/${driveId}`)
    expect(res.status).toBe(200)
    expect(res.body.score).toEqual(JSON.parse(JSON.stringify(expected)))
    const counts = await testDb()
      .selectFrom("sample_decoded")
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .where("drive_id", "=", driveId)
      .executeTakeFirstOrThrow()
    expect(res.body.drive.counts.samples).toBe(Number(counts.n))
    const scoreRoute = await team.tech.get(`/api/drives/${driveId}/score`)
    expect(scoreRoute.body).toEqual(res.body.score)
    return expected
  }
})
