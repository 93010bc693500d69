// House rule and api.md "Errors": bad input gets a 4xx with {error:{code,message,fields?}}, never a 500,
// and nothing is half-stored. Every route that takes a body or a query gets the same barrage.
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { withCheckDigit } from "@/lib/vin"
import { checklistBody } from "../../helpers/checklist"
import type { ApiClient, ApiResponse } from "../../helpers/http"
import { inventedVin } from "../../helpers/jobs"
import { buildWorld, driveFile, expectErrorShape, snapshotShop, type World } from "./world"

let w: World

beforeAll(async () => {
  w = await buildWorld("Bad input")
})

const HUGE = "x".repeat(300_000)
const NUL = "bad\u0000text"
const LONE_SURROGATE = "half \ud800 a pair"
const SQLISH = "'; drop table drive; --"
const UNICODE = "Ünïcödé 🚗 مرحبا 車"

/** Payloads that are not a JSON object at all: sent as raw text. */
const RAW_BODIES: Array<[string, string]> = [
  ["malformed JSON", "{"],
  ["truncated JSON", '{"a": '],
  ["an empty body", ""],
  ["whitespace only", "   \n"],
  ["NaN (not JSON)", '{"t": NaN}'],
  ["Infinity (not JSON)", '{"t": Infinity}'],
  ["JSON null", "null"],
  ["a JSON array", "[]"],
  ["an array of objects", "[{}]"],
  ["a JSON string", '"text"'],
  ["a JSON number", "42"],
  ["JSON true", "true"],
  ["a deeply nested array", "[".repeat(5000) + "]".repeat(5000)],
]

type BodyRoute = {
  /** "METHOD /path", `:name` standing for an id; the method is read from it, and the path unless `path` is given. */
  name: `${"POST" | "PATCH" | "PUT"} /${string}`
  /** The path to call when it is not the one in the name: its ids filled in, or a query added. */
  path?: () => string
  client: () => ApiClient
  /** Bodies that must be refused with a 4xx. */
  bad: () => Array<[string, unknown]>
  /** Whether `{}` is a valid body for this route (then it is left out of the must-refuse list). */
  emptyObjectOk?: boolean
  /** Every field optional and a body-less call meaningful (api.md): an empty body is not bad input here. */
  emptyBodyOk?: boolean
}

/** `base` with `value` at the dotted `path` (numeric parts index arrays). */
function withAt(base: unknown, path: string, value: unknown): unknown {
  const copy = structuredClone(base) as Record<string, unknown>
  const parts = path.split(".")
  let node: any = copy
  for (const p of parts.slice(0, -1)) node = node[p]
  node[parts.at(-1)!] = value
  return copy
}

/** Text fields: wrong types, over-long, NUL and broken UTF-16 are always refused. */
function badText(base: unknown, path: string, opts: { nullable?: boolean } = {}): Array<[string, unknown]> {
  const out: Array<[string, unknown]> = [
    [`${path} a number`, withAt(base, path, 5)],
    [`${path} an array`, withAt(base, path, ["a"])],
    [`${path} an object`, withAt(base, path, { a: 1 })],
    [`${path} true`, withAt(base, path, true)],
    [`${path} 300 kB`, withAt(base, path, HUGE)],
    [`${path} with NUL`, withAt(base, path, NUL)],
    [`${path} with a lone surrogate`, withAt(base, path, LONE_SURROGATE)],
  ]
  if (!opts.nullable) out.push([`${path} null`, withAt(base, path, null)])
  return out
}

function badNumber(base: unknown, path: string, extra: unknown[] = []): Array<[string, unknown]> {
  return [
    [`${path} a string`, withAt(base, path, "twelve")],
    [`${path} an array`, withAt(base, path, [1])],
    [`${path} an object`, withAt(base, path, { n: 1 })],
    [`${path} 1e309 (Infinity once parsed)`, withAt(base, path, "__INF__")],
    [`${path} -1e309`, withAt(base, path, "__NEGINF__")],
    ...extra.map((v): [string, unknown] => [`${path} ${String(v)}`, withAt(base, path, v)]),
  ]
}

function badEnum(base: unknown, path: string): Array<[string, unknown]> {
  return [
    [`${path} unknown value`, withAt(base, path, "bogus")],
    [`${path} SQL-ish`, withAt(base, path, SQLISH)],
    [`${path} a number`, withAt(base, path, 3)],
    [`${path} with NUL`, withAt(base, path, NUL)],
  ]
}

function badUuid(base: unknown, path: string): Array<[string, unknown]> {
  return [
    [`${path} not a UUID`, withAt(base, path, "not-a-uuid")],
    [`${path} 36 dashes`, withAt(base, path, "-".repeat(36))],
    [`${path} SQL-ish`, withAt(base, path, SQLISH)],
    [`${path} a number`, withAt(base, path, 7)],
    [`${path} with NUL`, withAt(base, path, NUL)],
  ]
}

/** JSON.stringify cannot write 1e309; the markers are swapped for the literal after stringifying. */
function toRaw(body: unknown): string {
  return JSON.stringify(body).replaceAll('"__INF__"', "1e309").replaceAll('"__NEGINF__"', "-1e309")
}

async function send(route: BodyRoute, raw: string): Promise<ApiResponse> {
  const [method, namedPath] = route.name.split(" ") as [string, string]
  if (!route.path && namedPath.includes(":")) throw new Error(`${route.name}: a path with ids needs path()`)
  const path = route.path?.() ?? namedPath
  return route.client().request(method, path, undefined, { raw, headers: { "content-type": "application/json" } })
}

function sample(t: number) {
  return { t, lat: 41.5, lon: -88.1, speed: 20, accuracy: 4 }
}

const ROUTES: BodyRoute[] = [
  {
    name: "POST /api/session",
    client: () => w.c.anon,
    bad: () => {
      const base = { email: w.shop.tech.email, password: "whatever-wrong-1" }
      return [
        ...badText(base, "email"),
        ...badText(base, "password"),
        ["email not an address", { ...base, email: SQLISH }],
      ]
    },
  },
  {
    name: "POST /api/drives",
    client: () => w.c.technician,
    emptyObjectOk: true,
    emptyBodyOk: true,
    bad: () => {
      // No client id in the base: a replayed id is answered with the stored drive before its body is read.
      const base = { vehicleDescription: "2020 Invented Larkin" }
      return [
        ...badUuid(base, "id"),
        ...badUuid({ ...base, jobId: w.job.id }, "jobId"),
        ...badUuid({ ...base, taskId: w.job.taskId }, "taskId"),
        ...badText(base, "vehicleDescription"),
        ...badText({ ...base, profileKey: "forward-radar" }, "profileKey"),
        ...badText({ ...base, coDriverId: w.shop.codriver.id }, "coDriverId", { nullable: true }),
        ["coDriverId SQL-ish", { ...base, coDriverId: SQLISH }],
        ["coDriverId unknown", { ...base, coDriverId: randomUUID() }],
        ["jobId unknown", { ...base, jobId: randomUUID() }],
        ["profileKey unknown", { ...base, profileKey: "no-such-profile" }],
        ["profile an array", { ...base, profile: [] }],
        ["profile a string", { ...base, profile: "fast" }],
        ...badNumber({ ...base, profile: { minSpeedMph: 35 } }, "profile.minSpeedMph", [-1]),
        ...badNumber({ ...base, profile: { maxDecelMps2: 3 } }, "profile.maxDecelMps2", [0, -3]),
        ["profile lead gap min over max", { ...base, profile: { leadGapFt: { min: 200, max: 100 } } }],
      ]
    },
  },
  {
    name: "POST /api/drives/:id/samples",
    path: () => `/api/drives/${w.recording.id}/samples`,
    client: () => w.c.technician,
    bad: () => {
      const base = { batchId: `bad-${randomUUID()}`, samples: [sample(1_800_000_000_000), sample(1_800_000_001_000)] }
      return [
        ...badText(base, "batchId"),
        ["batchId empty", { ...base, batchId: "" }],
        ["samples an object", { ...base, samples: { 0: sample(1) } }],
        ["samples missing", { batchId: base.batchId }],
        ["samples null", { ...base, samples: null }],
        ["samples of strings", { ...base, samples: ["a"] }],
        [
          "too many samples",
          { ...base, samples: Array.from({ length: 10_001 }, (_, i) => sample(1_900_000_000_000 + i)) },
        ],
        ...badNumber(base, "samples.1.t", [-1, 1.5, 2 ** 63, null]),
        ...badNumber(base, "samples.1.lat", [90.0001, -91, null]),
        ...badNumber(base, "samples.1.lon", [180.5, -181]),
        ...badNumber(base, "samples.1.speed", [-0.1]),
        ...badNumber(base, "samples.1.accuracy", [-5]),
      ]
    },
  },
  {
    name: "POST /api/drives/:id/marks",
    path: () => `/api/drives/${w.recording.id}/marks`,
    client: () => w.c.co_driver,
    bad: () => {
      const base = {
        marks: [
          { id: randomUUID(), t: 1_800_000_000_000, kind: "lead-on" },
          { id: randomUUID(), t: 1_800_000_001_000, kind: "note", text: "ok" },
        ],
      }
      return [
        ["marks an object", { marks: { a: 1 } }],
        ["marks missing", {}],
        [
          "too many marks",
          {
            marks: Array.from({ length: 501 }, (_, i) => ({
              id: randomUUID(),
              t: 1_800_000_000_000 + i,
              kind: "lead-on",
            })),
          },
        ],
        ...badUuid(base, "marks.1.id"),
        ...badEnum(base, "marks.1.kind"),
        ...badNumber(base, "marks.1.t", [-1, 0.5]),
        ...badText(base, "marks.1.text", { nullable: false }),
        ["note without text", withAt(base, "marks.1.text", "  ")],
        ["gap without gapFt", withAt(base, "marks.1", { id: randomUUID(), t: 1_800_000_002_000, kind: "gap" })],
        ...badNumber(
          withAt(base, "marks.1", { id: randomUUID(), t: 1_800_000_002_000, kind: "gap", gapFt: 130 }),
          "marks.1.gapFt",
          [-1],
        ),
      ]
    },
  },
  {
    name: "POST /api/drives/import",
    path: () => `/api/drives/import?jobId=${w.job.id}&taskId=${w.job.taskId}`,
    client: () => w.c.technician,
    bad: () => {
      const base = driveFile(3)
      return [
        ["format missing", { ...base, format: undefined }],
        ...badEnum(base, "format"),
        ["samples an object", { ...base, samples: {} }],
        ["marks missing", { ...base, marks: undefined }],
        ...badNumber(base, "samples.3.lat", [95]),
        ...badNumber(base, "samples.3.t", [-10]),
        ...badEnum(base, "marks.0.kind"),
        [
          "a note mark with NUL text",
          { ...base, marks: [...base.marks, { t: base.samples[5]!.t, kind: "note", text: NUL }] },
        ],
        [
          "a note mark with a lone surrogate",
          { ...base, marks: [...base.marks, { t: base.samples[5]!.t, kind: "note", text: LONE_SURROGATE }] },
        ],
        ...badNumber({ ...base, profile: { minSpeedMph: 35 } }, "profile.minSpeedMph", [-1]),
      ]
    },
  },
  {
    name: "POST /api/score",
    client: () => w.c.co_driver,
    bad: () => {
      const base = driveFile(4)
      return [
        ...badEnum(base, "format"),
        ...badNumber(base, "samples.0.lon", [200]),
        ["samples a string", { ...base, samples: "many" }],
      ]
    },
  },
  {
    name: "POST /api/drives/:id/review",
    path: () => `/api/drives/${w.finished.id}/review`,
    client: () => w.c.shop_lead,
    bad: () => {
      const base = { decision: "redo", note: "Drive the qualifying stretch again." }
      return [
        ...badEnum(base, "decision"),
        ...badText(base, "note"),
        ["redo without a note", { decision: "redo" }],
        ["redo with a blank note", { decision: "redo", note: "   " }],
      ]
    },
  },
  {
    name: "POST /api/drives/:id/record/email",
    path: () => `/api/drives/${w.finished.id}/record/email`,
    client: () => w.c.shop_lead,
    bad: () => {
      const base = { to: "owner@customer.invalid" }
      return [
        ...badText(base, "to"),
        ["to not an address", { to: SQLISH }],
        ["to two addresses", { to: "a@b.invalid, c@d.invalid" }],
        ["to with a header", { to: "a@b.invalid\r\nBcc: x@y.invalid" }],
      ]
    },
  },
  {
    name: "POST /api/drives/:id/share",
    path: () => `/api/drives/${w.finished.id}/share`,
    client: () => w.c.shop_lead,
    emptyObjectOk: true,
    bad: () => badNumber({ expiresInDays: 7 }, "expiresInDays", [0, -1, 1.5, 1e9]),
  },
  {
    name: "POST /api/jobs",
    client: () => w.c.shop_lead,
    bad: () => {
      const base = {
        roNumber: `RO-${randomUUID().slice(0, 8)}`,
        customer: { name: "Pell Oduya", email: "pell@example.invalid", phone: "555-0101" },
        vehicle: { vin: inventedVin(), make: "Corvane", model: "Tallis" },
        tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "replaced" }],
      }
      return [
        ...badText(base, "roNumber"),
        ...badText(base, "customer.name"),
        ...badText(base, "customer.phone", { nullable: true }),
        ...badText(base, "vehicle.make", { nullable: true }),
        ...badText(base, "vehicle.vin"),
        [
          "vin with a wrong check digit",
          withAt(base, "vehicle.vin", withCheckDigit("0ZT4R8AB0RW123456").replace(/^(.{8})./, "$1Z")),
        ],
        ["vin SQL-ish", withAt(base, "vehicle.vin", SQLISH)],
        ...badNumber(base, "vehicle.year", [1900, 2024.5, -2024]),
        ["customer an array", withAt(base, "customer", [])],
        ["tasks empty", withAt(base, "tasks", [])],
        ["tasks an object", withAt(base, "tasks", { 0: base.tasks[0] })],
        ...badEnum(base, "tasks.0.sensor"),
        ...badEnum(base, "tasks.0.method"),
        ...badEnum(base, "tasks.0.reason"),
        ...badUuid(base, "tasks.0.profileId"),
        ["tasks.0.profileId unknown", withAt(base, "tasks.0.profileId", randomUUID())],
      ]
    },
  },
  {
    name: "PATCH /api/jobs/:id",
    path: () => `/api/jobs/${w.job.id}`,
    client: () => w.c.shop_lead,
    bad: () => {
      const base = { roNumber: "RO-STAYS", customer: { name: "Pell Oduya" } }
      return [
        ...badText(base, "roNumber"),
        ...badText(base, "customer.name"),
        [
          "tasks with an id of no task",
          { tasks: [{ id: randomUUID(), sensor: "forward_radar", method: "dynamic", reason: "replaced" }] },
        ],
        ...badEnum({ tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "replaced" }] }, "tasks.0.sensor"),
        ...badUuid(
          { tasks: [{ id: w.job.taskId, sensor: "forward_radar", method: "dynamic", reason: "replaced" }] },
          "tasks.0.id",
        ),
      ]
    },
  },
  {
    name: "PUT /api/jobs/:id/tasks/:taskId/checklist",
    path: () => `/api/jobs/${w.job.id}/tasks/${w.job.taskId}/checklist`,
    client: () => w.c.technician,
    bad: () => {
      const base = checklistBody()
      return [
        ...badText(base, "notes"),
        ...badEnum(base, "fuelLevel"),
        ...badEnum(base, "tires.unit"),
        ...badNumber(base, "tires.fl", [0, -35, 1e6, null]),
        ["tires.fl NaN text", withAt(base, "tires.fl", "NaN")],
        ["tires.fl Infinity text", withAt(base, "tires.fl", "Infinity")],
        ["loadNormal a string", withAt(base, "loadNormal", "yes")],
        ["faultCodes.expected with SQL-ish", withAt(base, "faultCodes", { none: false, expected: [SQLISH] })],
        ["faultCodes.expected with NUL", withAt(base, "faultCodes", { none: false, expected: [NUL] })],
        ["faultCodes none but codes listed", withAt(base, "faultCodes", { none: true, expected: ["U0415"] })],
      ]
    },
  },
  {
    name: "POST /api/profiles",
    client: () => w.c.shop_lead,
    bad: () => {
      const base = {
        name: "Radar, highway",
        key: `k-${randomUUID().slice(0, 6)}`,
        sensor: "forward_radar",
        settings: { minSpeedMph: 40 },
      }
      return [
        ...badText(base, "name"),
        ...badText(base, "key"),
        ["key SQL-ish", withAt(base, "key", SQLISH)],
        ...badEnum(base, "sensor"),
        ...badNumber(base, "settings.minSpeedMph", [-1]),
        ["settings an array", withAt(base, "settings", [])],
      ]
    },
  },
  {
    name: "PATCH /api/profiles/:id",
    path: () => `/api/profiles/${w.profileId}`,
    client: () => w.c.shop_lead,
    bad: () => {
      const base = { name: "Renamed", settings: { minSpeedMph: 40 } }
      return [
        ...badText(base, "name"),
        ...badNumber(base, "settings.minSpeedMph", [-1]),
        ["archived a string", { archived: "yes" }],
        ...badEnum({ sensor: "forward_radar" }, "sensor"),
      ]
    },
  },
  {
    name: "POST /api/users",
    client: () => w.c.admin,
    bad: () => {
      const base = {
        email: `new-${randomUUID().slice(0, 6)}@test.invalid`,
        name: "Tamsin Orr",
        role: "technician",
        password: "a-long-enough-password",
      }
      return [
        ...badText(base, "name"),
        ...badText(base, "email"),
        ...badText(base, "password"),
        ...badEnum(base, "role"),
        ["password short", { ...base, password: "short" }],
      ]
    },
  },
  {
    name: "PATCH /api/users/:id",
    path: () => `/api/users/${w.shop.tech.id}`,
    client: () => w.c.admin,
    bad: () => {
      const base = { name: "Renamed Person" }
      return [
        ...badText(base, "name"),
        ...badEnum({ role: "technician" }, "role"),
        ["disabled a string", { disabled: "true" }],
      ]
    },
  },
  {
    name: "PATCH /api/shop/settings",
    client: () => w.c.admin,
    bad: () => [
      ...badEnum({ units: "metric" }, "units"),
      ...badNumber({ tirePressureTolerancePsi: 3 }, "tirePressureTolerancePsi", [0, -3, 100]),
    ],
  },
  {
    name: "PATCH /api/notifications",
    client: () => w.c.technician,
    bad: () => [
      ["all false", { all: false }],
      ["all a string", { all: "true" }],
      ["ids empty", { ids: [] }],
      ...badUuid({ ids: [randomUUID()] }, "ids.0"),
      ["ids too many", { ids: Array.from({ length: 101 }, () => randomUUID()) }],
    ],
  },
  {
    name: "POST /api/uploads",
    client: () => w.c.technician,
    bad: () => {
      const base = { jobId: w.job.id, filename: "photo.jpg", contentType: "image/jpeg", size: 1000 }
      return [
        ...badUuid(base, "jobId"),
        ...badText(base, "filename"),
        ["filename with a slash", withAt(base, "filename", "../../etc/passwd")],
        ...badText(base, "contentType"),
        ["contentType not allowed", withAt(base, "contentType", "text/html")],
        ...badNumber(base, "size", [0, -1, 1.5, null]),
      ]
    },
  },
]

describe("bad bodies are refused with a 4xx in the error shape and store nothing", () => {
  for (const route of ROUTES) {
    it(`${route.name}`, async () => {
      const cases: Array<[string, string]> = RAW_BODIES.filter(([, raw]) => !(route.emptyBodyOk && raw.trim() === ""))
      if (!route.emptyObjectOk) {
        cases.push(["an empty object", "{}"], ["unknown keys only", '{"__proto__": {"admin": true}, "constructor": 1}'])
      }
      for (const [label, body] of route.bad()) cases.push([label, toRaw(body)])
      const before = await snapshotShop(w.shop.shopId)
      const failures: string[] = []
      for (const [label, raw] of cases) {
        const res = await send(route, raw)
        if (res.status < 400 || res.status >= 500) {
          failures.push(`${label}: ${res.status} ${res.text.slice(0, 200)}`)
          continue
        }
        expectErrorShape(res)
      }
      expect(failures).toEqual([])
      expect(await snapshotShop(w.shop.shopId)).toEqual(before)
    })
  }
})

describe("odd but well-formed text never breaks a route", () => {
  it("stores unicode and SQL-ish text exactly as sent", async () => {
    for (const text of [UNICODE, SQLISH, "Robert'); --", "%_\\", "<script>alert(1)</script>"]) {
      const id = randomUUID()
      const res = await w.c.technician.post("/api/drives", { id, vehicleDescription: text })
      expect(res.status).toBe(201)
      expect(res.body.drive.vehicleDescription).toBe(text)
      const mark = await w.c.technician.post(`/api/drives/${id}/marks`, {
        marks: [{ id: randomUUID(), t: 1_800_000_000_000, kind: "note", text }],
      })
      expect(mark.status).toBe(200)
      const file = await w.c.technician.get(`/api/drives/${id}/file`)
      expect(JSON.parse(file.text).marks[0].text).toBe(text)
    }
  })

  it("searches jobs with unicode, SQL-ish and LIKE wildcards without a 500", async () => {
    for (const q of [UNICODE, SQLISH, "%", "_", "\\", "%25", "' OR 1=1 --"]) {
      const res = await w.c.shop_lead.get(`/api/jobs?q=${encodeURIComponent(q)}`)
      expect(res.status, `${q}: ${res.text.slice(0, 200)}`).toBe(200)
      expect(res.body.jobs).toEqual([])
    }
  })
})

const QUERY_CASES: Array<{ name: string; client: () => ApiClient; paths: () => string[] }> = [
  {
    name: "GET /api/drives",
    client: () => w.c.shop_lead,
    paths: () => [
      "/api/drives?verdict=bogus",
      "/api/drives?status=deleted",
      "/api/drives?status=%00",
      "/api/drives?cursor=garbage",
      `/api/drives?cursor=${encodeURIComponent(`9999-99-99T99:99:99Z|${randomUUID()}`)}`,
      `/api/drives?cursor=${encodeURIComponent(`2026-13-45T25:61:61.123Z|${randomUUID()}`)}`,
      `/api/drives?cursor=${encodeURIComponent(`2026-01-01T00:00:00Z|${"-".repeat(36)}`)}`,
      `/api/drives?cursor=${encodeURIComponent(`2026-01-01T00:00:00Z|${"g".repeat(36)}`)}`,
      `/api/drives?cursor=${"x".repeat(5000)}`,
      "/api/drives?cursor=%00",
    ],
  },
  {
    name: "GET /api/review",
    client: () => w.c.shop_lead,
    paths: () => [
      "/api/review?cursor=garbage",
      `/api/review?cursor=${encodeURIComponent(`9999-99-99T99:99:99Z|${randomUUID()}`)}`,
      `/api/review?cursor=${encodeURIComponent(`2026-01-01T00:00:00Z|${"-".repeat(36)}`)}`,
    ],
  },
  {
    name: "GET /api/jobs",
    client: () => w.c.shop_lead,
    paths: () => {
      const cursor = (value: unknown, id: unknown) => Buffer.from(JSON.stringify([value, id])).toString("base64url")
      return [
        "/api/jobs?status=bogus",
        "/api/jobs?limit=-1",
        "/api/jobs?limit=NaN",
        "/api/jobs?limit=Infinity",
        "/api/jobs?limit=1e999",
        "/api/jobs?limit=2.5",
        "/api/jobs?sort=ro_number;drop",
        "/api/jobs?dir=sideways",
        `/api/jobs?q=${"q".repeat(500)}`,
        "/api/jobs?q=%00",
        "/api/jobs?cursor=not-base64-json",
        `/api/jobs?cursor=${cursor("garbage", randomUUID())}`,
        `/api/jobs?sort=status&cursor=${cursor("garbage", randomUUID())}`,
        `/api/jobs?sort=updatedAt&cursor=${cursor("9999-99-99", randomUUID())}`,
        `/api/jobs?cursor=${cursor("2026-01-01T00:00:00Z", "-".repeat(36))}`,
        `/api/jobs?sort=roNumber&cursor=${cursor("a\u0000b", randomUUID())}`,
      ]
    },
  },
  {
    name: "GET /api/numbers",
    client: () => w.c.shop_lead,
    paths: () => [
      "/api/numbers?days=-1",
      "/api/numbers?days=NaN",
      "/api/numbers?days=Infinity",
      "/api/numbers?days=1e9",
      "/api/numbers?days=1.5",
      "/api/numbers?format=xml",
    ],
  },
  {
    name: "GET /api/people",
    client: () => w.c.technician,
    paths: () => ["/api/people?role=bogus", "/api/people?role=%00"],
  },
  {
    name: "GET /api/drives/:id/file",
    client: () => w.c.technician,
    paths: () => [`/api/drives/${w.finished.id}/file?format=pdf`, `/api/drives/${w.finished.id}/file?format=%00`],
  },
  {
    name: "POST /api/drives/import (query)",
    client: () => w.c.technician,
    paths: () => [
      "/api/drives/import?jobId=abc",
      `/api/drives/import?taskId=${"-".repeat(36)}`,
      `/api/drives/import?jobId=${randomUUID()}`,
      `/api/drives/import?jobId=${w.job.id}&taskId=${w.bareJob.taskId}`,
    ],
  },
]

describe("bad query strings are a 4xx in the error shape", () => {
  for (const q of QUERY_CASES) {
    it(q.name, async () => {
      const before = await snapshotShop(w.shop.shopId)
      const failures: string[] = []
      for (const path of q.paths()) {
        const res = q.name.startsWith("POST") ? await q.client().post(path, driveFile(2)) : await q.client().get(path)
        if (res.status < 400 || res.status >= 500)
          failures.push(`${path.slice(0, 120)}: ${res.status} ${res.text.slice(0, 200)}`)
        else expectErrorShape(res)
      }
      expect(failures).toEqual([])
      expect(await snapshotShop(w.shop.shopId)).toEqual(before)
    })
  }
})

describe("path ids that are not ids are a 404 (or 400), never a 500", () => {
  const ODD_IDS = [
    "abc",
    "123",
    "-".repeat(36),
    "00000000-0000-0000-0000-00000000000g",
    "%00",
    "%E2%9C%93",
    "'%20or%201=1",
    "x".repeat(2000),
    "..%2F..%2Fetc",
  ]
  const paths = (id: string, good: { drive: string; job: string; task: string }) =>
    [
      ["GET", `/api/drives/${id}`],
      ["POST", `/api/drives/${id}/samples`],
      ["POST", `/api/drives/${id}/marks`],
      ["DELETE", `/api/drives/${good.drive}/marks/${id}`],
      ["POST", `/api/drives/${id}/finish`],
      ["GET", `/api/drives/${id}/score`],
      ["GET", `/api/drives/${id}/file`],
      ["GET", `/api/drives/${id}/record`],
      ["POST", `/api/drives/${id}/record/email`],
      ["POST", `/api/drives/${id}/share`],
      ["POST", `/api/drives/${id}/review`],
      ["GET", `/api/jobs/${id}`],
      ["PATCH", `/api/jobs/${id}`],
      ["GET", `/api/jobs/${id}/tasks/${good.task}/checklist`],
      ["GET", `/api/jobs/${good.job}/tasks/${id}/checklist`],
      ["PUT", `/api/jobs/${good.job}/tasks/${id}/checklist`],
      ["GET", `/api/attachments/${id}`],
      ["POST", `/api/uploads/${id}/complete`],
      ["GET", `/api/profiles/${id}`],
      ["PATCH", `/api/profiles/${id}`],
      ["PATCH", `/api/users/${id}`],
    ] as const

  it("answers every route with a 4xx in the error shape", async () => {
    const before = await snapshotShop(w.shop.shopId)
    const failures: string[] = []
    const good = { drive: w.recording.id, job: w.job.id, task: w.job.taskId }
    const bodies: Record<string, unknown> = {
      samples: { batchId: "x", samples: [] },
      marks: { marks: [] },
      email: { to: "a@b.invalid" },
      review: { decision: "approve" },
      checklist: checklistBody(),
      jobs: { roNumber: "RO-X" },
      profiles: { name: "X" },
      users: { name: "X" },
    }
    const bodyFor = (path: string) => Object.entries(bodies).find(([k]) => path.includes(`/${k}`))?.[1] ?? {}
    for (const id of ODD_IDS) {
      for (const [method, path] of paths(id, good)) {
        const res = await w.c.admin.request(
          method,
          path,
          method === "GET" || method === "DELETE" ? undefined : bodyFor(path),
        )
        if (![400, 404].includes(res.status))
          failures.push(`${method} ${path.slice(0, 100)}: ${res.status} ${res.text.slice(0, 160)}`)
        else expectErrorShape(res)
      }
    }
    expect(failures).toEqual([])
    expect(await snapshotShop(w.shop.shopId)).toEqual(before)
  })

  it("answers a well-formed id that does not exist with a 404 on every route", async () => {
    const failures: string[] = []
    const good = { drive: w.recording.id, job: w.job.id, task: w.job.taskId }
    for (const [method, path] of paths(randomUUID(), good)) {
      const body =
        method === "GET" || method === "DELETE"
          ? undefined
          : path.includes("/checklist")
            ? checklistBody()
            : path.includes("/email")
              ? { to: "a@b.invalid" }
              : path.includes("/review")
                ? { decision: "approve" }
                : path.includes("/samples")
                  ? { batchId: "x", samples: [] }
                  : path.includes("/marks")
                    ? { marks: [] }
                    : { name: "X", roNumber: "RO-X" }
      const res = await w.c.admin.request(method, path, body)
      // DELETE of a mark that is not there is a 204 by design (the recorder's undo is idempotent).
      const expected = method === "DELETE" ? 204 : 404
      if (res.status !== expected) failures.push(`${method} ${path}: ${res.status} ${res.text.slice(0, 160)}`)
      else if (expected === 404) expectErrorShape(res)
    }
    expect(failures).toEqual([])
  })
})
