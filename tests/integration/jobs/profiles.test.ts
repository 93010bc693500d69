import { beforeAll, describe, expect, it } from "vitest"
import { createTestShop, insertDrive, testDb, type TestShop } from "../../helpers/db"
import { signedIn } from "../../helpers/http"
import { createJob } from "../../helpers/jobs"

let shop: TestShop
beforeAll(async () => {
  shop = await createTestShop("Profiles")
})

describe("condition profiles", () => {
  it("lets a shop lead create one with every key resolved to drive-file.md defaults", async () => {
    const lead = await signedIn(shop.lead)
    const res = await lead.post("/api/profiles", {
      name: "Highway radar",
      sensor: "forward_radar",
      settings: { minSpeedMph: 45 },
    })
    expect(res.status).toBe(201)
    expect(res.body.profile).toMatchObject({ key: "highway-radar", version: 1, archived: false })
    // drive-file.md defaults: maxDriveMinutes 30, maxDecelMps2 3.4 (AASHTO), leadGapFt 100-165 (common practice)
    expect(res.body.profile.settings).toEqual({
      minSpeedMph: 45,
      maxSpeedMph: null,
      leadGapFt: { min: 100, max: 165 },
      minQualifyingMinutes: 10,
      minFollowingMinutes: 2,
      maxDriveMinutes: 30,
      maxAccelMps2: 3,
      maxDecelMps2: 3.4,
      maxGapSeconds: 5,
      maxAccuracyM: 30,
      verifySpeedMph: 25,
    })
    const dup = await lead.post("/api/profiles", { name: "Highway radar" })
    expect(dup.status).toBe(409)
    const bad = await lead.post("/api/profiles", { name: "Bad", settings: { leadGapFt: { min: 200, max: 100 } } })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields["settings.leadGapFt.max"]).toBeDefined()
  })

  it("keeps writes to shop leads and admins", async () => {
    const tech = await signedIn(shop.tech)
    expect((await tech.post("/api/profiles", { name: "Tech's own" })).status).toBe(403)
    expect((await tech.get("/api/profiles")).status).toBe(200)
    const admin = await signedIn(shop.admin)
    expect((await admin.post("/api/profiles", { name: "Admin's own" })).status).toBe(201)
  })

  it("makes a new version on edit, and a drive made on the old version keeps it and its settings", async () => {
    const lead = await signedIn(shop.lead)
    const created = await lead.post("/api/profiles", {
      key: "corner-test",
      name: "Corner test",
      sensor: "corner_radar",
      settings: { minFollowingMinutes: 0 },
    })
    const profileId = created.body.profile.id
    const v1 = created.body.profile.versionId
    const job = await createJob(lead, { tasks: [{ sensor: "corner_radar", method: "dynamic", reason: "replaced" }] })
    expect(job.tasks[0].profile).toMatchObject({ id: profileId, version: 1, versionId: v1 })

    // A drive frozen on version 1, as the drive API stores it.
    const { id: driveId } = await insertDrive(shop, {
      job_id: job.id,
      task_id: job.tasks[0].id,
      profile_version_id: v1,
      profile: JSON.stringify(created.body.profile.settings),
      driver_id: shop.lead.id,
      verdict: "met",
    })

    const edit = await lead.patch(`/api/profiles/${profileId}`, {
      settings: { minFollowingMinutes: 0, minSpeedMph: 50 },
    })
    expect(edit.status).toBe(200)
    expect(edit.body.profile).toMatchObject({ version: 2 })
    expect(edit.body.profile.versionId).not.toBe(v1)
    expect(edit.body.versions.map((v: { version: number }) => v.version)).toEqual([2, 1])
    expect(edit.body.versions[1].settings.minSpeedMph).toBe(35)

    const drive = await testDb()
      .selectFrom("drive")
      .select(["profile_version_id", "profile", "verdict"])
      .where("public_id", "=", driveId)
      .executeTakeFirstOrThrow()
    expect(drive.profile_version_id).toBe(v1)
    expect((drive.profile as { minSpeedMph: number }).minSpeedMph).toBe(35)
    expect(drive.verdict).toBe("met")
    const oldVersion = await testDb()
      .selectFrom("condition_profile_version")
      .select("settings")
      .where("id", "=", v1)
      .executeTakeFirstOrThrow()
    expect((oldVersion.settings as { minSpeedMph: number }).minSpeedMph).toBe(35)

    // The task now points at the current version for new drives.
    const detail = await lead.get(`/api/jobs/${job.id}`)
    expect(detail.body.job.tasks[0].profile).toMatchObject({ version: 2, settings: { minSpeedMph: 50 } })

    // Renaming alone, or saving the same settings, makes no version.
    const rename = await lead.patch(`/api/profiles/${profileId}`, {
      name: "Corner, renamed",
      settings: { minFollowingMinutes: 0, minSpeedMph: 50 },
    })
    expect(rename.body.profile).toMatchObject({ name: "Corner, renamed", version: 2 })
  })

  it("is 404 across shops", async () => {
    const other = await createTestShop("Profiles other")
    const created = await (await signedIn(other.lead)).post("/api/profiles", { name: "Theirs" })
    const lead = await signedIn(shop.lead)
    expect((await lead.get(`/api/profiles/${created.body.profile.id}`)).status).toBe(404)
    expect((await lead.patch(`/api/profiles/${created.body.profile.id}`, { name: "Mine" })).status).toBe(404)
  })
})
