// Issue "a sealed record": Finish is ordered with data in flight (one lock per drive), a mark must fall inside
// the drive, late data makes a new revision of the record, and the shop's leads hear when a verdict changes.
import { randomUUID } from "node:crypto"
import { describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { parseDriveFile, type DriveFile } from "@/lib/drive-file"
import { canonicalJson } from "@/lib/record/seal"
import { scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"
import { createTestShop, testDb } from "../../helpers/db"
import { signedIn, type ApiClient } from "../../helpers/http"
import { setUpShopTeam } from "../../helpers/team"
import { waitForMail } from "../review/fixtures"
import { postNamedBatch, startDrive } from "./helpers"

/** The stored score and the score of the drive's own exported file, both as JSON travels. */
async function storedAndExported(client: ApiClient, driveId: string) {
  const [score, file] = await Promise.all([
    client.get(`/api/drives/${driveId}/score`),
    client.get(`/api/drives/${driveId}/file?format=drive`),
  ])
  expect(score.status).toBe(200)
  const parsed = parseDriveFile(JSON.parse(file.text))
  if (!parsed.ok) throw new Error("the exported drive file does not parse")
  return { stored: score.body, exported: JSON.parse(JSON.stringify(scoreDrive(parsed.file))), file: parsed.file }
}

async function countRows(publicId: string, shopId: string) {
  const db = testDb()
  // sample_decoded names drives by public id; the tables by internal id. Every drive here is the shop's.
  const driveId = internalDriveId(shopId, publicId)
  const n = async (table: "mark" | "sample_decoded" | "score_revision") =>
    Number(
      (
        await db
          .selectFrom(table)
          .select((eb) => eb.fn.countAll<string>().as("n"))
          .where("drive_id", "=", table === "sample_decoded" ? publicId : driveId)
          .where("shop_id", "=", shopId)
          .executeTakeFirstOrThrow()
      ).n,
    )
  return { marks: await n("mark"), samples: await n("sample_decoded"), revisions: await n("score_revision") }
}

describe("Finish sent together with the last batches and marks", () => {
  const team = setUpShopTeam("SealRace")

  it("stores, 30 times in 30, the score of everything accepted: equal to scoreDrive of the exported file", async () => {
    const file: DriveFile = generateDrive({ seed: 31, minutes: 20, pattern: "met" })
    expect(file.samples).toHaveLength(1200)
    expect(scoreDrive(file).verdict).toBe("met")
    // The last 3 marks (the learn complete and the function check among them) are still in flight at the finish.
    const early = file.marks.slice(0, -3)
    const late = file.marks.slice(-3)
    const lateMarks = late.map((m) => ({ ...m, id: randomUUID() }))
    const missed: string[] = []
    for (let run = 0; run < 30; run++) {
      const drive = await startDrive(team.tech, { coDriverId: team.shop.codriver.id })
      const first = await team.tech.post(`/api/drives/${drive.id}/samples`, {
        batchId: `r${run}-first`,
        samples: file.samples.slice(0, 800),
      })
      expect(first.status).toBe(200)
      const marks = await team.codriver.post(`/api/drives/${drive.id}/marks`, {
        marks: early.map((m) => ({ ...m, id: randomUUID() })),
      })
      expect(marks.status).toBe(200)
      // The driver taps Finish while the phone's outbox still sends the last 4 batches and the co-driver logs 3 marks.
      const writes: Array<() => Promise<{ status: number; text: string }>> = [
        ...[0, 1, 2, 3].map(
          (b) => () =>
            team.tech.post(`/api/drives/${drive.id}/samples`, {
              batchId: `r${run}-b${b}`,
              samples: file.samples.slice(800 + b * 100, 900 + b * 100),
            }),
        ),
        ...lateMarks.map(
          (m) => () => team.codriver.post(`/api/drives/${drive.id}/marks`, { marks: [{ ...m, id: randomUUID() }] }),
        ),
      ]
      const at = run % (writes.length + 1)
      writes.splice(at, 0, () => team.tech.post(`/api/drives/${drive.id}/finish`))
      const answers = await Promise.all(writes.map((w) => w()))
      for (const a of answers) expect(a.status, a.text.slice(0, 200)).toBe(200)
      const { stored, exported, file: saved } = await storedAndExported(team.tech, drive.id)
      expect(saved.samples).toHaveLength(1200)
      expect(saved.marks).toHaveLength(early.length + 3)
      if (canonicalJson(stored) !== canonicalJson(exported))
        missed.push(
          `run ${run}: stored ${stored.samplesUsed} samples ${stored.verdict}, file ${exported.samplesUsed} ${exported.verdict}`,
        )
      expect(stored).toEqual(exported)
      // The latest revision holds that same score.
      const revisions = await team.tech.get(`/api/drives/${drive.id}/revisions`)
      expect(revisions.body.revisions[0].score).toEqual(exported)
    }
    expect(missed).toEqual([])
  }, 240_000)
})

describe("a sealed drive", () => {
  const team = setUpShopTeam("Sealed")

  /** A 31-min drive that ended just now and never reported the learn complete: Not met. */
  async function finishedNeverCleared() {
    const startMs = Date.now() - 32 * 60_000
    const file = generateDrive({ seed: 77, startMs, minutes: 31, pattern: "never-cleared" })
    const drive = await startDrive(team.tech)
    expect(
      (await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "all", samples: file.samples })).status,
    ).toBe(200)
    expect(
      (
        await team.tech.post(`/api/drives/${drive.id}/marks`, {
          marks: file.marks.map((m) => ({ ...m, id: randomUUID() })),
        })
      ).status,
    ).toBe(200)
    const finished = await team.tech.post(`/api/drives/${drive.id}/finish`)
    expect(finished.status).toBe(200)
    expect(finished.body.score.verdict).toBe("not_met")
    return { id: drive.id, file, startMs }
  }

  it("refuses a mark 2 h after the finish with a 400 naming marks.<i>.t, and changes nothing", async () => {
    const drive = await finishedNeverCleared()
    const before = await countRows(drive.id, team.shop.shopId)
    const scoreBefore = (await team.tech.get(`/api/drives/${drive.id}/score`)).body
    const inside = { id: randomUUID(), t: drive.startMs + 10 * 60_000, kind: "note", text: "inside" }
    const res = await team.tech.post(`/api/drives/${drive.id}/marks`, {
      marks: [inside, { id: randomUUID(), t: Date.now() + 2 * 3_600_000, kind: "cleared" }],
    })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe("validation_failed")
    expect(Object.keys(res.body.error.fields)).toEqual(["marks.1.t"])
    expect(res.body.error.fields["marks.1.t"]).toMatch(/min after the drive finished/)
    expect(res.body.error.message).toMatch(/outside the drive/)
    const early = await team.tech.post(`/api/drives/${drive.id}/marks`, {
      marks: [{ id: randomUUID(), t: drive.startMs - 10 * 60_000, kind: "lead-on", gapFt: 120 }],
    })
    expect(early.status).toBe(400)
    expect(early.body.error.fields["marks.0.t"]).toMatch(/before the drive's first position/)
    expect(await countRows(drive.id, team.shop.shopId)).toEqual(before)
    expect((await team.tech.get(`/api/drives/${drive.id}/score`)).body).toEqual(scoreBefore)
  })

  it("takes a mark logged inside the drive that arrives after the finish: revision 2, a notice and an e-mail for the lead", async () => {
    const drive = await finishedNeverCleared()
    const cleared = { id: randomUUID(), t: drive.startMs + 20 * 60_000, kind: "cleared" }
    const res = await team.tech.post(`/api/drives/${drive.id}/marks`, { marks: [cleared] })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ accepted: 1, duplicates: 0 })
    const { stored, exported } = await storedAndExported(team.tech, drive.id)
    expect(stored).toEqual(exported)
    expect(stored.verdict).not.toBe("not_met")

    const history = await team.lead.get(`/api/drives/${drive.id}/revisions`)
    expect(history.status).toBe(200)
    const revisions = history.body.revisions
    expect(revisions.map((r: { revision: number }) => r.revision)).toEqual([2, 1])
    expect(revisions.map((r: { cause: string }) => r.cause)).toEqual(["late_marks", "finish"])
    expect(revisions[1].score.verdict).toBe("not_met")
    expect(revisions[0].score).toEqual(stored)
    expect(revisions[0].code).toMatch(/^[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}$/)
    expect(revisions[0].digest).toMatch(/^[0-9a-f]{64}$/)
    expect(revisions[0].digest).not.toBe(revisions[1].digest)

    // The same mark again (an outbox replay) changes nothing: no third revision.
    expect((await team.tech.post(`/api/drives/${drive.id}/marks`, { marks: [cleared] })).body).toMatchObject({
      accepted: 0,
      duplicates: 1,
    })
    expect((await countRows(drive.id, team.shop.shopId)).revisions).toBe(2)

    const notices = await team.lead.get("/api/notifications")
    const notice = notices.body.notifications.find((n: { link: string }) => n.link === `/drives/${drive.id}`)
    expect(notice?.message).toMatch(/changed after the finish, from Not met to /)
    const mail = await waitForMail(team.admin, team.shop.lead.email)
    expect(mail?.subject).toMatch(/^Verdict changed after the finish/)
    // The technician who logged it is not a lead: no notice for them.
    const techNotices = await team.tech.get("/api/notifications")
    expect(techNotices.body.notifications.some((n: { link: string }) => n.link === `/drives/${drive.id}`)).toBe(false)
  })

  it("answers 409 to marks, samples and undo once a lead has reviewed the drive, and the review is revision 3", async () => {
    const drive = await finishedNeverCleared()
    const markId = randomUUID()
    expect(
      (
        await team.tech.post(`/api/drives/${drive.id}/marks`, {
          marks: [{ id: markId, t: drive.startMs + 20 * 60_000, kind: "cleared" }],
        })
      ).status,
    ).toBe(200)
    const reviewed = await team.lead.post(`/api/drives/${drive.id}/review`, { decision: "approve", note: "" })
    expect(reviewed.status).toBe(200)
    const before = await countRows(drive.id, team.shop.shopId)
    const mark = await team.tech.post(`/api/drives/${drive.id}/marks`, {
      marks: [{ id: randomUUID(), t: drive.startMs + 60_000, kind: "note", text: "late" }],
    })
    const samples = await team.tech.post(`/api/drives/${drive.id}/samples`, {
      batchId: "after-review",
      samples: [{ t: drive.startMs + 31 * 60_000 + 500, lat: 40, lon: -75 }],
    })
    const undo = await team.tech.delete(`/api/drives/${drive.id}/marks/${markId}`)
    for (const r of [mark, samples, undo]) {
      expect(r.status).toBe(409)
      expect(r.body.error.code).toBe("conflict")
    }
    expect(await countRows(drive.id, team.shop.shopId)).toEqual(before)
    const revisions = (await team.lead.get(`/api/drives/${drive.id}/revisions`)).body.revisions
    expect(revisions.map((r: { cause: string }) => r.cause)).toEqual(["review", "late_marks", "finish"])
    expect(revisions[0].reviewDecision).toBe("approve")
    // Both scores are kept: the one of the finish and the one after the late mark.
    expect(revisions[2].score.verdict).toBe("not_met")
    expect(revisions[1].score.verdict).toBe(revisions[0].score.verdict)
  })

  /** One late batch made one revision after the finish's, and the stored score is the score of the exported file. */
  async function expectRescoredOnce(driveId: string) {
    const revisions = (await team.tech.get(`/api/drives/${driveId}/revisions`)).body.revisions
    expect(revisions.map((r: { cause: string }) => r.cause)).toEqual(["late_samples", "finish"])
    const { stored, exported } = await storedAndExported(team.tech, driveId)
    expect(stored).toEqual(exported)
  }

  it("rescores once per late batch, and a batch sent again makes no revision", async () => {
    const drive = await finishedNeverCleared()
    const extra = [
      { t: Date.now() - 30_000, lat: drive.file.samples.at(-1)!.lat, lon: drive.file.samples.at(-1)!.lon, speed: 0 },
    ]
    const late = { batchId: "late-1", samples: extra }
    expect((await team.tech.post(`/api/drives/${drive.id}/samples`, late)).status).toBe(200)
    expect((await team.tech.post(`/api/drives/${drive.id}/samples`, late)).status).toBe(200)
    await expectRescoredOnce(drive.id)
  })

  it("rescores a late batch named in x-batch-id, which the app's own server answers, the same way", async () => {
    const drive = await finishedNeverCleared()
    const samples = [
      { t: Date.now() - 30_000, lat: drive.file.samples.at(-1)!.lat, lon: drive.file.samples.at(-1)!.lon },
    ]
    expect((await postNamedBatch(team.tech, drive.id, "late-named", samples)).body).toEqual({
      accepted: 1,
      duplicates: 0,
      replayed: false,
    })
    expect((await postNamedBatch(team.tech, drive.id, "late-named", samples)).body).toMatchObject({ replayed: true })
    await expectRescoredOnce(drive.id)
  })

  it("keeps another shop's revisions to that shop (404)", async () => {
    const drive = await finishedNeverCleared()
    const other = await createTestShop("SealedOther")
    const res = await (await signedIn(other.lead)).get(`/api/drives/${drive.id}/revisions`)
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe("not_found")
  })
})
