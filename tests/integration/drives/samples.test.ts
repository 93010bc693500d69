import { randomUUID } from "node:crypto"
import http from "node:http"
import { describe, expect, it } from "vitest"
import { sessionIdFromToken } from "@/lib/auth/lucia"
import { storedSample } from "@/lib/drive-file/stored"
import { createTestShop, testDb } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { signedIn } from "../../helpers/http"
import { setUpShopTeam } from "../../helpers/team"
import { addPerson, namedBatchHeaders, postNamedBatch, sampleRun, startDrive } from "./helpers"

async function storedSamples(driveId: string) {
  return testDb().selectFrom("sample_decoded").selectAll().where("drive_id", "=", driveId).orderBy("t").execute()
}

describe("POST /api/drives/:id/samples", () => {
  const team = setUpShopTeam("Samples")

  it("counts a batch sent twice once", async () => {
    const drive = await startDrive(team.tech)
    const samples = sampleRun(40)
    const batchId = randomUUID()
    const first = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId, samples })
    expect(first.status).toBe(200)
    expect(first.body).toMatchObject({ accepted: 40, duplicates: 0 })
    const again = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId, samples })
    expect(again.status).toBe(200)
    expect(again.body.replayed).toBe(true)
    const rows = await storedSamples(drive.id)
    expect(rows).toHaveLength(40)
    expect(rows.map((r) => r.t)).toEqual(samples.map((s) => s.t))
    // Stored at 1e-7 degree, mm/s and mm (lib/drive-file/stored.ts): within half a step of what was sent.
    const kept = storedSample(samples[7]!)
    expect(rows[7]).toMatchObject({ lat: kept.lat, lon: kept.lon, speed: kept.speed, accuracy: kept.accuracy })
    expect(Math.abs(rows[7]!.lat - samples[7]!.lat)).toBeLessThanOrEqual(5e-8)
  })

  it("answers a replay named in the x-batch-id header from its claim without reading the body", async () => {
    const drive = await startDrive(team.tech)
    const samples = sampleRun(30)
    const batchId = randomUUID()
    const path = `/api/drives/${drive.id}/samples`
    const headers = { "x-batch-id": batchId, "content-type": "application/json" }
    const first = await team.tech.request("POST", path, undefined, {
      raw: JSON.stringify({ batchId, samples }),
      headers,
    })
    expect(first.status).toBe(200)
    expect(first.body).toMatchObject({ accepted: 30, duplicates: 0 })
    // A body that is not even JSON: the claim answers before the body is read.
    const again = await team.tech.request("POST", path, undefined, { raw: "not json", headers })
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ accepted: 30, duplicates: 0, replayed: true })
    expect(await storedSamples(drive.id)).toHaveLength(30)
  })

  it("refuses a new batch whose body names another id than its x-batch-id header, storing nothing", async () => {
    const drive = await startDrive(team.tech)
    const path = `/api/drives/${drive.id}/samples`
    const raw = JSON.stringify({ batchId: "body-id", samples: sampleRun(5) })
    const res = await team.tech.request("POST", path, undefined, {
      raw,
      headers: { "x-batch-id": "header-id", "content-type": "application/json" },
    })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe("validation_failed")
    expect(res.body.error.fields).toHaveProperty(["batchId"])
    expect(await storedSamples(drive.id)).toHaveLength(0)
    // Neither id was used up: the batch goes in under the body's id.
    const ok = await team.tech.request("POST", path, undefined, {
      raw,
      headers: { "x-batch-id": "body-id", "content-type": "application/json" },
    })
    expect(ok.status).toBe(200)
    expect(await storedSamples(drive.id)).toHaveLength(5)
  })

  it("stores the union of overlapping batches, each time once", async () => {
    const drive = await startDrive(team.tech)
    const samples = sampleRun(60)
    const a = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "a", samples: samples.slice(0, 40) })
    const b = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "b", samples: samples.slice(25, 60) })
    expect(a.body).toMatchObject({ accepted: 40, duplicates: 0 })
    expect(b.body).toMatchObject({ accepted: 20, duplicates: 15 })
    const rows = await storedSamples(drive.id)
    expect(rows.map((r) => r.t)).toEqual(samples.map((s) => s.t))
  })

  it("stores nothing of a batch with one bad sample and names it", async () => {
    const drive = await startDrive(team.tech)
    const samples: unknown[] = sampleRun(10)
    samples[3] = { ...(samples[3] as object), lat: 91 }
    const res = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "bad", samples })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe("validation_failed")
    expect(res.body.error.fields).toHaveProperty(["samples.3.lat"])
    expect(res.body.error.fields["samples.3.lat"]).toMatch(/between -90 and 90/)
    expect(await storedSamples(drive.id)).toHaveLength(0)
    // The batch id was not used up by the failure: the corrected batch goes in whole.
    const fixed = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "bad", samples: sampleRun(10) })
    expect(fixed.body).toMatchObject({ accepted: 10, duplicates: 0 })
  })

  it("keeps the first copy of a time sent twice in one batch", async () => {
    const drive = await startDrive(team.tech)
    const [s0, s1] = sampleRun(2)
    const res = await team.tech.post(`/api/drives/${drive.id}/samples`, {
      batchId: "dup",
      samples: [s0, s1, { ...s1!, lat: s1!.lat + 0.001 }],
    })
    expect(res.body).toMatchObject({ accepted: 2, duplicates: 1 })
    const rows = await storedSamples(drive.id)
    expect(rows[1]!.lat).toBe(storedSample(s1!).lat)
  })

  it("answers 404 to another shop and to a co-driver the drive does not name", async () => {
    const drive = await startDrive(team.tech)
    const other = await createTestShop("Other")
    const outsider = await signedIn(other.lead)
    const res = await outsider.post(`/api/drives/${drive.id}/samples`, { batchId: "x", samples: sampleRun(3) })
    expect(res.status).toBe(404)
    expect(res.text).not.toContain(drive.id)
    const co = await signedIn(team.shop.codriver)
    expect((await co.post(`/api/drives/${drive.id}/samples`, { batchId: "x", samples: sampleRun(3) })).status).toBe(404)
    expect(await storedSamples(drive.id)).toHaveLength(0)
  })

  it("lets the named co-driver record, and refuses a technician who is neither driver nor co-driver", async () => {
    const drive = await startDrive(team.tech, { coDriverId: team.shop.codriver.id })
    const co = await signedIn(team.shop.codriver)
    expect((await co.post(`/api/drives/${drive.id}/samples`, { batchId: "c", samples: sampleRun(3) })).status).toBe(200)
    const tech2 = await signedIn(await addPerson(team.shop.shopId, "technician", team.shop.tech))
    expect((await tech2.post(`/api/drives/${drive.id}/samples`, { batchId: "d", samples: sampleRun(3) })).status).toBe(
      403,
    )
  })

  it("takes late samples after Finish and scores again, and refuses them once reviewed", async () => {
    const drive = await startDrive(team.tech)
    const samples = sampleRun(30)
    await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "1", samples: samples.slice(0, 10) })
    const finished = await team.tech.post(`/api/drives/${drive.id}/finish`)
    expect(finished.status).toBe(200)
    expect(finished.body.score.samplesUsed).toBe(10)
    const late = await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "2", samples: samples.slice(10) })
    expect(late.status).toBe(200)
    const score = await team.tech.get(`/api/drives/${drive.id}/score`)
    expect(score.body.samplesUsed).toBe(30)
    await testDb().updateTable("drive").set({ review_status: "approved" }).where("public_id", "=", drive.id).execute()
    const closed = await team.tech.post(`/api/drives/${drive.id}/samples`, {
      batchId: "3",
      samples: sampleRun(2, 9, Date.UTC(2026, 0, 2)),
    })
    expect(closed.status).toBe(409)
    expect(closed.body.error.code).toBe("conflict")
  })

  it("answers 400 for malformed JSON and a missing batch id", async () => {
    const drive = await startDrive(team.tech)
    const raw = await team.tech.request("POST", `/api/drives/${drive.id}/samples`, undefined, {
      raw: "{not json",
      headers: { "content-type": "application/json" },
    })
    expect(raw.status).toBe(400)
    const noBatch = await team.tech.post(`/api/drives/${drive.id}/samples`, { samples: sampleRun(2) })
    expect(noBatch.status).toBe(400)
    expect(noBatch.body.error.fields).toHaveProperty(["batchId"])
  })
})

// Batches that name themselves in x-batch-id (the recorder's) are answered by the app's own server before Next.js
// (app/_server/early-routes.ts); the others by Next and the route file. Both must answer alike.
describe("POST /api/drives/:id/samples named in x-batch-id (the app's server answers it)", () => {
  const team = setUpShopTeam("SamplesEarly")

  it("stores a batch and answers with the same headers as Next does", async () => {
    const drive = await startDrive(team.tech)
    const early = await postNamedBatch(team.tech, drive.id, "early", sampleRun(20))
    const viaNext = await team.tech.post(`/api/drives/${drive.id}/samples`, {
      batchId: "next",
      samples: sampleRun(20, 8, Date.UTC(2026, 0, 1, 11)),
    })
    expect(early.status).toBe(200)
    expect(early.body).toEqual({ accepted: 20, duplicates: 0, replayed: false })
    expect(viaNext.body).toEqual({ accepted: 20, duplicates: 0, replayed: false })
    for (const name of [
      "x-content-type-options",
      "x-frame-options",
      "referrer-policy",
      "cache-control",
      "content-type",
    ])
      expect([name, early.headers.get(name)]).toEqual([name, viaNext.headers.get(name)])
    expect(await storedSamples(drive.id)).toHaveLength(40)
  })

  it("adds HSTS when a trusted proxy says the request came over HTTPS, as Next's proxy does, and not otherwise", async () => {
    const drive = await startDrive(team.tech)
    const send = (batchId: string, proto: string | null, named: boolean) =>
      fetch(`${testEnv().baseUrl}/api/drives/${drive.id}/samples`, {
        method: "POST",
        headers: {
          ...(named ? namedBatchHeaders(batchId) : { "content-type": "application/json" }),
          ...(proto ? { "x-forwarded-proto": proto } : {}),
          cookie: team.tech.cookie!,
          "x-forwarded-for": team.tech.address,
        },
        body: JSON.stringify({ batchId, samples: sampleRun(2, 0, Date.UTC(2026, 0, 2, batchId.length)) }),
      })
    // The test stack trusts its proxy (TRUST_PROXY=1) and its APP_URL is plain http.
    const early = await send("https-early", "https", true)
    const viaNext = await send("https-via-next", "https", false)
    expect(early.status).toBe(200)
    expect(early.headers.get("strict-transport-security")).toMatch(/^max-age=\d+/)
    expect(early.headers.get("strict-transport-security")).toBe(viaNext.headers.get("strict-transport-security"))
    expect((await send("plain-early", null, true)).headers.get("strict-transport-security")).toBeNull()
  })

  it("keeps the connection for the next request after a replay whose body it did not read", async () => {
    const drive = await startDrive(team.tech)
    const path = `/api/drives/${drive.id}/samples`
    const agent = new http.Agent({ keepAlive: true, maxSockets: 1 })
    const send = (batchId: string, samples: unknown[]) =>
      new Promise<{ status: number; body: any; reused: boolean }>((resolve, reject) => {
        const text = JSON.stringify({ batchId, samples })
        const req = http.request(
          `${testEnv().baseUrl}${path}`,
          {
            method: "POST",
            agent,
            headers: { ...namedBatchHeaders(batchId), cookie: team.tech.cookie!, "x-forwarded-for": team.tech.address },
          },
          (res) => {
            let data = ""
            res.on("data", (chunk) => (data += chunk))
            res.on("end", () => resolve({ status: res.statusCode!, body: JSON.parse(data), reused: req.reusedSocket }))
          },
        )
        req.on("error", reject)
        req.end(text)
      })
    try {
      // A catch-up batch of 2,000 samples (lib/recorder/batching.ts), about 150 kB, then the same again.
      const big = sampleRun(2000)
      expect((await send("catch-up", big)).body).toEqual({ accepted: 2000, duplicates: 0, replayed: false })
      const replay = await send("catch-up", big)
      expect(replay).toMatchObject({ status: 200, body: { accepted: 2000, duplicates: 0, replayed: true } })
      const next = await send("after", sampleRun(5, 9, Date.UTC(2026, 0, 1, 12)))
      expect(next).toMatchObject({ status: 200, body: { accepted: 5, duplicates: 0 }, reused: true })
      expect(await storedSamples(drive.id)).toHaveLength(2005)
    } finally {
      agent.destroy()
    }
  })

  it("refuses a body over the API's 8 MB limit 413, declared or chunked, answers the client and stores nothing", async () => {
    const drive = await startDrive(team.tech)
    // Over app/_server/route.ts MAX_JSON_BYTES; the batch is new, so its body is read (and counted) after the lookup.
    const over = Buffer.alloc(8 * 1024 * 1024 + 1, 0x20)
    const send = (batchId: string, declared: boolean) =>
      new Promise<{ status: number; body: any }>((resolve, reject) => {
        const req = http.request(
          `${testEnv().baseUrl}/api/drives/${drive.id}/samples`,
          {
            method: "POST",
            headers: {
              ...namedBatchHeaders(batchId),
              ...(declared ? { "content-length": over.length } : {}),
              cookie: team.tech.cookie!,
              "x-forwarded-for": team.tech.address,
            },
          },
          (res) => {
            let data = ""
            res.on("data", (chunk) => (data += chunk))
            res.on("end", () => resolve({ status: res.statusCode!, body: JSON.parse(data) }))
          },
        )
        req.on("error", reject)
        // Without a Content-Length, node:http sends the pieces chunked: the server counts them as they come.
        for (let at = 0; at < over.length; at += 1024 * 1024) req.write(over.subarray(at, at + 1024 * 1024))
        req.end()
      })
    for (const declared of [true, false]) {
      const res = await send(declared ? "declared" : "chunked", declared)
      expect([declared, res.status, res.body.error.code]).toEqual([declared, 413, "too_large"])
    }
    expect(await storedSamples(drive.id)).toHaveLength(0)
  })

  it("refuses a batch sent from another site 403, as every write is", async () => {
    const drive = await startDrive(team.tech)
    const res = await fetch(`${testEnv().baseUrl}/api/drives/${drive.id}/samples`, {
      method: "POST",
      headers: {
        ...namedBatchHeaders("elsewhere"),
        origin: "https://elsewhere.example",
        cookie: team.tech.cookie!,
        "x-forwarded-for": team.tech.address,
      },
      body: JSON.stringify({ batchId: "elsewhere", samples: sampleRun(3) }),
    })
    expect(res.status).toBe(403)
    expect((await res.json()).error.code).toBe("forbidden")
    expect(await storedSamples(drive.id)).toHaveLength(0)
  })

  it("answers a signed-out cookie 401 in the error shape and clears it, as Next does", async () => {
    const client = await signedIn(team.shop.tech)
    const drive = await startDrive(client)
    const cookie = client.cookie!
    expect((await client.delete("/api/session")).status).toBe(204)
    for (const headers of [namedBatchHeaders("gone"), { "content-type": "application/json" }]) {
      const res = await fetch(`${testEnv().baseUrl}/api/drives/${drive.id}/samples`, {
        method: "POST",
        headers: { ...headers, cookie, "x-forwarded-for": client.address },
        body: JSON.stringify({ batchId: "gone", samples: sampleRun(3) }),
      })
      expect(res.status).toBe(401)
      expect((await res.json()).error.code).toBe("not_signed_in")
      expect(res.headers.get("set-cookie")).toMatch(new RegExp(`^${cookie.split("=")[0]}=;`))
    }
    expect(await storedSamples(drive.id)).toHaveLength(0)
  })

  it("checks the session as Lucia does: slides one past half its life, and refuses a disabled user", async () => {
    const person = await addPerson(team.shop.shopId, "technician", team.shop.tech)
    const client = await signedIn(person)
    const drive = await startDrive(client)
    const token = client.cookie!.slice(client.cookie!.indexOf("=") + 1)
    const session = () => testDb().selectFrom("user_session").selectAll().where("id", "=", sessionIdFromToken(token))
    const expireIn = (ms: number) =>
      testDb()
        .updateTable("user_session")
        .set({ expires_at: new Date(Date.now() + ms) })
        .where("id", "=", sessionIdFromToken(token))
        .execute()
    // Three hours left of twelve: the batch is stored and the session slides, with a fresh cookie.
    await expireIn(3 * 3_600_000)
    const slid = await postNamedBatch(client, drive.id, "slid", sampleRun(3))
    expect(slid.status).toBe(200)
    expect(slid.headers.get("set-cookie")).toContain(token)
    const renewed = (await session().executeTakeFirstOrThrow()).expires_at.getTime()
    expect(renewed).toBeGreaterThan(Date.now() + 11 * 3_600_000)
    // Settled (more than half its life left): no cookie is sent again.
    const settled = await postNamedBatch(client, drive.id, "settled", sampleRun(3, 8, Date.UTC(2026, 0, 1, 11)))
    expect(settled.status).toBe(200)
    expect(settled.headers.get("set-cookie")).toBeNull()
    // Disabled: refused, and the user's sessions end.
    await testDb().updateTable("app_user").set({ disabled: true }).where("id", "=", person.id).execute()
    const disabled = await postNamedBatch(client, drive.id, "disabled", sampleRun(3, 9, Date.UTC(2026, 0, 1, 12)))
    expect(disabled.status).toBe(401)
    expect(await session().executeTakeFirst()).toBeUndefined()
    expect(await storedSamples(drive.id)).toHaveLength(6)
  })

  it("refuses a batch on an expired session (401), clears the cookie and deletes the session", async () => {
    const client = await signedIn(await addPerson(team.shop.shopId, "technician", team.shop.tech))
    const drive = await startDrive(client)
    const sessionId = sessionIdFromToken(client.cookie!.slice(client.cookie!.indexOf("=") + 1))
    const samples = sampleRun(3)
    expect((await postNamedBatch(client, drive.id, "before", samples)).status).toBe(200)
    await testDb()
      .updateTable("user_session")
      .set({ expires_at: new Date(Date.now() - 1000) })
      .where("id", "=", sessionId)
      .execute()
    // Even the replay of a stored batch: its claim is not answered to an expired session.
    const replay = await postNamedBatch(client, drive.id, "before", samples)
    expect(replay.status).toBe(401)
    expect(replay.body.error.code).toBe("not_signed_in")
    expect(replay.headers.get("set-cookie")).toMatch(/^straightaway_session=;/)
    expect(
      await testDb().selectFrom("user_session").select("id").where("id", "=", sessionId).executeTakeFirst(),
    ).toBeUndefined()
  })

  it("refuses a write from another site (403) and a path that is no drive id (404), storing nothing", async () => {
    const drive = await startDrive(team.tech)
    const raw = JSON.stringify({ batchId: "x", samples: sampleRun(3) })
    const elsewhere = await team.tech.request("POST", `/api/drives/${drive.id}/samples`, undefined, {
      raw,
      headers: { ...namedBatchHeaders("x"), origin: "http://elsewhere.invalid" },
    })
    expect(elsewhere.status).toBe(403)
    expect(elsewhere.body.error.code).toBe("forbidden")
    const noId = await team.tech.request("POST", `/api/drives/not-a-drive/samples`, undefined, {
      raw,
      headers: namedBatchHeaders("x"),
    })
    expect(noId.status).toBe(404)
    expect(noId.body.error.code).toBe("not_found")
    expect(await storedSamples(drive.id)).toHaveLength(0)
  })

  it("refuses a replay to a technician who may not record on the drive (403), though the batch is stored", async () => {
    const drive = await startDrive(team.tech)
    const samples = sampleRun(3)
    expect((await postNamedBatch(team.tech, drive.id, "claimed", samples)).status).toBe(200)
    const tech2 = await signedIn(await addPerson(team.shop.shopId, "technician", team.shop.tech))
    const replay = await postNamedBatch(tech2, drive.id, "claimed", samples)
    expect(replay.status).toBe(403)
    expect(replay.body.error.code).toBe("forbidden")
  })

  it("refuses a replay once a lead has reviewed the drive (409)", async () => {
    const drive = await startDrive(team.tech)
    const samples = sampleRun(3)
    expect((await postNamedBatch(team.tech, drive.id, "before-review", samples)).status).toBe(200)
    expect((await team.tech.post(`/api/drives/${drive.id}/finish`)).status).toBe(200)
    await testDb().updateTable("drive").set({ review_status: "approved" }).where("public_id", "=", drive.id).execute()
    const replay = await postNamedBatch(team.tech, drive.id, "before-review", samples)
    expect(replay.status).toBe(409)
    expect(replay.body.error.code).toBe("conflict")
  })

  it("keeps another shop's drive a 404", async () => {
    const drive = await startDrive(team.tech)
    const other = await signedIn((await createTestShop("SamplesEarlyOther")).tech)
    const res = await postNamedBatch(other, drive.id, "y", sampleRun(3))
    expect(res.status).toBe(404)
    expect(await storedSamples(drive.id)).toHaveLength(0)
  })
})
