// The role matrix: api.md's "who" column, route by route, for each role and for a signed-out client.
// "admin ... can do all of the above" (api.md Roles); "co_driver: only drives naming them": a drive that
// does not name the co-driver is a 404 to them, like another shop's (shared drive rules).
// Routes not in api.md's table follow DEVELOPERS.md's route table (users: admin; profiles: shop lead; ...).
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { checklistBody } from "../../helpers/checklist"
import { signedIn, type ApiClient, type ApiResponse } from "../../helpers/http"
import { newJobBody } from "../../helpers/jobs"
import {
  buildWorld,
  driveFile,
  expectErrorShape,
  importDrive,
  recordedDrive,
  ROLE_NAMES,
  samplesOf,
  userOf,
  type RoleName,
  type World,
} from "./world"

type Who = RoleName | "anon"
const WHO: readonly Who[] = [...ROLE_NAMES, "anon"]

let w: World
/** Drives for Finish: one driven by the technician naming the co-driver, one by the other technician. */
let toFinish: { own: string; foreign: string }
let tCounter = 0

beforeAll(async () => {
  w = await buildWorld("Roles")
  const [own, foreign] = await Promise.all([
    recordedDrive(w.c.technician, w.shop.codriver.id),
    recordedDrive(w.otherTech, null),
  ])
  toFinish = { own: own.id, foreign: foreign.id }
})

/** Allowed roles answer `ok`; the other signed-in roles 403; signed out 401. Admin is always allowed. */
function allow(roles: RoleName[], ok: number, overrides: Partial<Record<Who, number>> = {}): Record<Who, number> {
  const out = { anon: 401 } as Record<Who, number>
  for (const r of ROLE_NAMES) out[r] = r === "admin" || roles.includes(r) ? ok : 403
  return { ...out, ...overrides }
}
const EVERYONE: RoleName[] = ["technician", "co_driver", "shop_lead", "admin"]

type Row = { route: string; expect: Record<Who, number>; call: (client: ApiClient, who: Who) => Promise<ApiResponse> }

function nextT() {
  tCounter += 1
  return Date.UTC(2027, 0, 1) + tCounter * 1000
}

/**
 * A read of a drive (or of what hangs off it, `suffix`): everyone in the shop reads the drive that names the
 * co-driver; the co-driver gets a 404 on one that does not name them.
 */
function driveReads(suffix: string): Row[] {
  return [
    {
      route: `GET /api/drives/:id${suffix} (names the co-driver)`,
      expect: allow(EVERYONE, 200),
      call: (c) => c.get(`/api/drives/${w.finished.id}${suffix}`),
    },
    {
      route: `GET /api/drives/:id${suffix} (does not name them)`,
      expect: allow(EVERYONE, 200, { co_driver: 404 }),
      call: (c) => c.get(`/api/drives/${w.foreign.id}${suffix}`),
    },
  ]
}

const ROWS: Row[] = [
  // api.md table
  { route: "GET /api/session", expect: allow(EVERYONE, 200), call: (c) => c.get("/api/session") },
  {
    route: "DELETE /api/session",
    expect: allow(EVERYONE, 204),
    call: async (c, who) =>
      who === "anon" ? c.delete("/api/session") : (await signedIn(userOf(w.shop, who))).delete("/api/session"),
  },
  { route: "GET /api/drives", expect: allow(EVERYONE, 200), call: (c) => c.get("/api/drives") },
  {
    route: "POST /api/drives",
    expect: allow(["technician", "shop_lead"], 201),
    call: (c) => c.post("/api/drives", { id: randomUUID() }),
  },
  ...driveReads(""),
  {
    route: "POST /api/drives/:id/samples (their drive)",
    expect: allow(EVERYONE, 200),
    call: (c) =>
      c.post(`/api/drives/${w.recording.id}/samples`, { batchId: randomUUID(), samples: samplesOf(2, 3, nextT()) }),
  },
  {
    route: "POST /api/drives/:id/samples (another technician's drive)",
    expect: allow(EVERYONE, 200, { technician: 403, co_driver: 404 }),
    call: (c) =>
      c.post(`/api/drives/${w.foreign.id}/samples`, { batchId: randomUUID(), samples: samplesOf(2, 3, nextT()) }),
  },
  {
    route: "POST /api/drives/:id/marks (their drive)",
    expect: allow(EVERYONE, 200),
    call: (c) =>
      c.post(`/api/drives/${w.recording.id}/marks`, { marks: [{ id: randomUUID(), t: nextT(), kind: "lead-on" }] }),
  },
  {
    route: "POST /api/drives/:id/marks (another technician's drive)",
    expect: allow(EVERYONE, 200, { technician: 403, co_driver: 404 }),
    // A finished drive is sealed: the mark's time must fall inside it (DEVELOPERS.md "Record revisions and verification").
    call: (c) =>
      c.post(`/api/drives/${w.foreign.id}/marks`, {
        marks: [{ id: randomUUID(), t: driveFile(9).samples[100]!.t, kind: "lead-on" }],
      }),
  },
  {
    route: "POST /api/drives/:id/finish (their drive)",
    expect: allow(["technician", "shop_lead"], 200),
    call: (c) => c.post(`/api/drives/${toFinish.own}/finish`),
  },
  {
    route: "POST /api/drives/:id/finish (another technician's drive)",
    expect: allow(["shop_lead"], 200, { technician: 403, co_driver: 404 }),
    call: (c) => c.post(`/api/drives/${toFinish.foreign}/finish`),
  },
  ...driveReads("/score"),
  {
    route: "GET /api/drives/:id/file (names the co-driver)",
    expect: allow(EVERYONE, 200),
    call: (c) => c.get(`/api/drives/${w.finished.id}/file?format=csv`),
  },
  {
    route: "GET /api/drives/:id/file (does not name them)",
    expect: allow(EVERYONE, 200, { co_driver: 404 }),
    call: (c) => c.get(`/api/drives/${w.foreign.id}/file`),
  },
  {
    route: "POST /api/drives/import",
    expect: allow(["technician", "shop_lead"], 201),
    call: (c) => c.post("/api/drives/import", driveFile(31)),
  },
  { route: "POST /api/score", expect: allow(EVERYONE, 200), call: (c) => c.post("/api/score", driveFile(32)) },
  { route: "GET /api/review", expect: allow(["shop_lead"], 200), call: (c) => c.get("/api/review") },
  {
    route: "POST /api/drives/:id/review",
    expect: allow(["shop_lead"], 200),
    // Each allowed reviewer gets a drive of their own to decide; the others are refused on one that waits.
    call: async (c, who) => {
      const id = who === "shop_lead" || who === "admin" ? await importDrive(w.c.shop_lead, 33) : w.finished.id
      return c.post(`/api/drives/${id}/review`, { decision: "approve" })
    },
  },
  { route: "GET /api/vin/:vin", expect: allow(EVERYONE, 200), call: (c) => c.get("/api/vin/1J9RP1A36A1644345") },
  { route: "GET /api/jobs", expect: allow(["technician", "shop_lead"], 200), call: (c) => c.get("/api/jobs") },
  {
    route: "POST /api/jobs",
    expect: allow(["technician", "shop_lead"], 201),
    call: (c) => c.post("/api/jobs", newJobBody()),
  },
  {
    route: "GET /api/jobs/:id (a drive names the co-driver)",
    expect: allow(EVERYONE, 200),
    call: (c) => c.get(`/api/jobs/${w.job.id}`),
  },
  {
    route: "GET /api/jobs/:id (no drive names them)",
    expect: allow(EVERYONE, 200, { co_driver: 404 }),
    call: (c) => c.get(`/api/jobs/${w.bareJob.id}`),
  },
  {
    route: "POST /api/uploads",
    expect: allow(["technician", "shop_lead"], 201),
    call: (c) =>
      c.post("/api/uploads", { jobId: w.job.id, filename: "x.pdf", contentType: "application/pdf", size: 100 }),
  },
  {
    route: "POST /api/uploads/:id/complete",
    expect: allow(["technician", "shop_lead"], 200),
    call: (c) => c.post(`/api/uploads/${w.attachmentId}/complete`),
  },
  ...driveReads("/record"),
  {
    route: "POST /api/drives/:id/record/email",
    expect: allow(["shop_lead"], 202),
    call: (c) => c.post(`/api/drives/${w.finished.id}/record/email`, { to: "owner@customer.invalid" }),
  },
  { route: "GET /api/dev/mail", expect: allow([], 200), call: (c) => c.get("/api/dev/mail") },
  // DEVELOPERS.md route table and the shared drive and job rules
  {
    route: "DELETE /api/drives/:id/marks/:markId (their drive)",
    expect: allow(EVERYONE, 204),
    call: (c) => c.delete(`/api/drives/${w.recording.id}/marks/${randomUUID()}`),
  },
  {
    route: "POST /api/drives/:id/share",
    expect: allow(["shop_lead"], 201),
    call: (c) => c.post(`/api/drives/${w.finished.id}/share`, {}),
  },
  {
    route: "GET /api/jobs/:id/tasks/:taskId/checklist",
    expect: allow(EVERYONE, 200),
    call: (c) => c.get(`/api/jobs/${w.job.id}/tasks/${w.job.taskId}/checklist`),
  },
  {
    route: "GET /api/jobs/:id/tasks/:taskId/checklist (no drive names them)",
    expect: allow(EVERYONE, 200, { co_driver: 404 }),
    call: (c) => c.get(`/api/jobs/${w.bareJob.id}/tasks/${w.bareJob.taskId}/checklist`),
  },
  {
    route: "PUT /api/jobs/:id/tasks/:taskId/checklist",
    expect: allow(["technician", "shop_lead"], 200),
    call: (c) => c.request("PUT", `/api/jobs/${w.job.id}/tasks/${w.job.taskId}/checklist`, checklistBody()),
  },
  {
    route: "PATCH /api/jobs/:id",
    expect: allow(["technician", "shop_lead"], 200),
    call: (c) => c.patch(`/api/jobs/${w.job.id}`, { customer: { name: "Wren Castellano" } }),
  },
  {
    route: "GET /api/attachments/:id",
    expect: allow(EVERYONE, 200),
    call: (c) => c.get(`/api/attachments/${w.attachmentId}`),
  },
  {
    route: "GET /api/people",
    expect: allow(["technician", "shop_lead"], 200),
    call: (c) => c.get("/api/people?role=co_driver"),
  },
  { route: "GET /api/users", expect: allow([], 200), call: (c) => c.get("/api/users") },
  {
    route: "POST /api/users",
    expect: allow([], 201),
    call: (c) =>
      c.post("/api/users", {
        email: `p-${randomUUID().slice(0, 8)}@test.invalid`,
        name: "Odile Brand",
        role: "co_driver",
        password: "a-long-enough-password",
      }),
  },
  {
    route: "PATCH /api/users/:id",
    expect: allow([], 200),
    call: (c) => c.patch(`/api/users/${w.shop.codriver.id}`, { name: w.shop.codriver.name }),
  },
  { route: "GET /api/profiles", expect: allow(EVERYONE, 200), call: (c) => c.get("/api/profiles") },
  { route: "GET /api/profiles/:id", expect: allow(EVERYONE, 200), call: (c) => c.get(`/api/profiles/${w.profileId}`) },
  {
    route: "POST /api/profiles",
    expect: allow(["shop_lead"], 201),
    call: (c) => c.post("/api/profiles", { name: `Roles ${randomUUID().slice(0, 8)}` }),
  },
  {
    route: "PATCH /api/profiles/:id",
    expect: allow(["shop_lead"], 200),
    call: (c) => c.patch(`/api/profiles/${w.profileId}`, { archived: false }),
  },
  { route: "GET /api/shop/settings", expect: allow(EVERYONE, 200), call: (c) => c.get("/api/shop/settings") },
  {
    route: "PATCH /api/shop/settings",
    expect: allow([], 200),
    call: (c) => c.patch("/api/shop/settings", { units: "imperial" }),
  },
  { route: "GET /api/notifications", expect: allow(EVERYONE, 200), call: (c) => c.get("/api/notifications") },
  {
    route: "PATCH /api/notifications",
    expect: allow(EVERYONE, 200),
    call: (c) => c.patch("/api/notifications", { all: true }),
  },
  { route: "GET /api/numbers", expect: allow(["shop_lead"], 200), call: (c) => c.get("/api/numbers") },
  // DEVELOPERS.md "Record revisions and verification"
  ...driveReads("/revisions"),
  {
    route: "POST /api/verify (public)",
    expect: allow(EVERYONE, 200, { anon: 200 }),
    call: (c) => c.post("/api/verify", { code: "0000-0000-0000" }),
  },
]

describe("the role matrix", () => {
  for (const row of ROWS) {
    it(`${row.route}: ${WHO.map((who) => `${who} ${row.expect[who]}`).join(", ")}`, async () => {
      const got: Record<string, number> = {}
      for (const who of WHO) {
        const client = who === "anon" ? w.c.anon : who === "co_driver" ? w.c.co_driver : w.c[who]
        const res = await row.call(client, who)
        got[who] = res.status
        if (res.status >= 400) expectErrorShape(res)
      }
      expect(got).toEqual(row.expect)
    })
  }

  it("a co-driver's drive list holds only the drives that name them", async () => {
    const res = await w.c.co_driver.get("/api/drives")
    const ids = res.body.drives.map((d: { id: string; coDriverId: string }) => d.id)
    expect(ids).toContain(w.finished.id)
    expect(ids).toContain(w.recording.id)
    expect(ids).not.toContain(w.foreign.id)
    for (const d of res.body.drives) expect(d.coDriverId).toBe(w.shop.codriver.id)
    const unnamed = await w.unnamedCo.get("/api/drives")
    expect(unnamed.body.drives).toEqual([])
  })

  it("a co-driver a drive does not name gets a 404 for it, its samples, marks and record", async () => {
    for (const [method, path, body] of [
      ["GET", `/api/drives/${w.finished.id}`, undefined],
      ["POST", `/api/drives/${w.recording.id}/samples`, { batchId: randomUUID(), samples: samplesOf(1, 3, nextT()) }],
      ["POST", `/api/drives/${w.recording.id}/marks`, { marks: [{ id: randomUUID(), t: nextT(), kind: "cleared" }] }],
      ["GET", `/api/drives/${w.finished.id}/record`, undefined],
      ["GET", `/api/jobs/${w.job.id}`, undefined],
    ] as const) {
      expectErrorShape(await w.unnamedCo.request(method, path, body), 404)
    }
  })
})
