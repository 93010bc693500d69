import { randomUUID } from "node:crypto"
import { describe, expect, it } from "vitest"
import { createTestShop, testDb } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { insertJob, insertScoredDrive, waitForMail } from "./fixtures"

async function storedJobStatus(jobId: string) {
  const row = await testDb().selectFrom("job").select("status").where("id", "=", jobId).executeTakeFirstOrThrow()
  return row.status
}

async function storedReviewStatus(internalDriveId: string) {
  const row = await testDb()
    .selectFrom("drive")
    .select("review_status")
    .where("id", "=", internalDriveId)
    .executeTakeFirstOrThrow()
  return row.review_status
}

describe("POST /api/drives/:id/review", () => {
  it("refuses technicians and co-drivers (403) and signed-out callers (401)", async () => {
    const shop = await createTestShop("ReviewRoles")
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 201 })
    for (const user of [shop.tech, shop.codriver]) {
      const res = await (await signedIn(user)).post(`/api/drives/${drive.id}/review`, { decision: "approve", note: "" })
      expect(res.status).toBe(403)
    }
    expect((await new ApiClient().post(`/api/drives/${drive.id}/review`, { decision: "approve" })).status).toBe(401)
    expect(await storedReviewStatus(drive.internalId)).toBeNull()
  })

  it("needs a note to send a drive back (400 naming note) and stores nothing without one", async () => {
    const shop = await createTestShop("ReviewNote")
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 202 })
    const lead = await signedIn(shop.lead)
    for (const body of [{ decision: "redo" }, { decision: "redo", note: "" }, { decision: "redo", note: "   " }]) {
      const res = await lead.post(`/api/drives/${drive.id}/review`, body)
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe("validation_failed")
      expect(res.body.error.fields.note).toMatch(/required/)
    }
    const bad = await lead.post(`/api/drives/${drive.id}/review`, { decision: "maybe", note: "x" })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.decision).toBeDefined()
    const reviews = await testDb().selectFrom("review").select("id").where("drive_id", "=", drive.internalId).execute()
    expect(reviews).toHaveLength(0)
  })

  it("sends a drive back: redo, the job reopens, the driver hears in the app and by e-mail, and it leaves the queue", async () => {
    const shop = await createTestShop("ReviewRedo")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 203, job })
    const lead = await signedIn(shop.lead)
    const note = `Only ${Math.floor(drive.score.qualifyingSecondsBeforeClear / 60)} min at speed; take the highway loop. ${randomUUID().slice(0, 6)}`

    const res = await lead.post(`/api/drives/${drive.id}/review`, { decision: "redo", note })
    expect(res.status).toBe(200)
    expect(res.body.drive.id).toBe(drive.id)
    expect(res.body.drive.reviewStatus).toBe("redo")
    expect(await storedJobStatus(job.jobId)).toBe("redo")

    const queue = await lead.get("/api/review")
    expect(queue.body.drives.map((d: { id: string }) => d.id)).not.toContain(drive.id)

    const tech = await signedIn(shop.tech)
    const notices = await tech.get("/api/notifications")
    expect(notices.status).toBe(200)
    expect(notices.body.unread).toBe(1)
    expect(notices.body.notifications[0].message).toContain(note)
    // It leads to the job, where "Drive again" is the main action.
    expect(notices.body.notifications[0].link).toBe(`/jobs/${job.jobId}`)
    // The lead, who decided, gets no notice of their own decision.
    expect((await lead.get("/api/notifications")).body.unread).toBe(0)

    const read = await tech.patch("/api/notifications", { ids: [notices.body.notifications[0].id] })
    expect(read.body.updated).toBe(1)
    expect((await tech.get("/api/notifications")).body.unread).toBe(0)

    const mail = await waitForMail(await signedIn(shop.admin), shop.tech.email)
    expect(mail?.subject).toContain("Drive sent back")
  })

  it("approves: the drive is approved and a one-task job is complete; a second decision is a 409", async () => {
    const shop = await createTestShop("ReviewApprove")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "harsh", seed: 204, job })
    const lead = await signedIn(shop.admin)
    const res = await lead.post(`/api/drives/${drive.id}/review`, {
      decision: "approve",
      note: "Braking was for a deer; fine.",
    })
    expect(res.status).toBe(200)
    expect(res.body.drive.reviewStatus).toBe("approved")
    expect(await storedJobStatus(job.jobId)).toBe("complete")

    const again = await lead.post(`/api/drives/${drive.id}/review`, { decision: "redo", note: "changed my mind" })
    expect(again.status).toBe(409)
    const reviews = await testDb()
      .selectFrom("review")
      .select("decision")
      .where("drive_id", "=", drive.internalId)
      .execute()
    expect(reviews.map((r) => r.decision)).toEqual(["approve"])
  })

  it("will not review a drive that is still being recorded (409)", async () => {
    const shop = await createTestShop("ReviewRecording")
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 205, status: "recording" })
    const res = await (await signedIn(shop.lead)).post(`/api/drives/${drive.id}/review`, { decision: "approve" })
    expect(res.status).toBe(409)
  })

  it("answers 404 for another shop's drive and for an id that is not a drive", async () => {
    const shop = await createTestShop("ReviewMine")
    const other = await createTestShop("ReviewTheirs")
    const theirs = await insertScoredDrive(other, { pattern: "short", seed: 206 })
    const lead = await signedIn(shop.lead)
    expect((await lead.post(`/api/drives/${theirs.id}/review`, { decision: "approve" })).status).toBe(404)
    expect((await lead.post(`/api/drives/not-a-uuid/review`, { decision: "approve" })).status).toBe(404)
    expect(await storedReviewStatus(theirs.internalId)).toBeNull()
  })
})
