// Demo jobs and finished, scored drives for the first demo shop. All invented: customers, makes and
// models, VINs (valid check digits from lib/vin), and tracks made by lib/tracks. Idempotent: a job whose
// RO number exists is left alone, so re-running changes nothing.
import { randomUUID } from "node:crypto"
import { internalDriveId } from "@/lib/drive-id"
import { resolveProfile } from "@/lib/drive-file/profile"
import { describeVehicle, VERDICT_WORD } from "@/lib/record/format"
import { storedSample } from "@/lib/drive-file/stored"
import { scoreDrive } from "@/lib/scoring"
import { generateDrive, type DrivePattern } from "@/lib/tracks"
import { withCheckDigit } from "@/lib/vin"
import type { Db } from "./client"
import { listProfiles } from "./queries/profiles"
import { markRow } from "./queries/marks"
import { insertSamples } from "./queries/samples"

type Outcome = "none" | "approved" | "redo"
type DemoDrive = {
  pattern: DrivePattern
  minutes: number
  daysAgo: number
  seed: number
  review?: Outcome
  note?: string
}
type DemoJob = {
  ro: string
  customer: { name: string; email: string; phone: string }
  vehicle: { vin: string; year: number; make: string; model: string; plate: string }
  task: { sensor: string; method: string; reason: string; profileKey: string }
  drives: DemoDrive[]
}

// Position 7 is a letter and position 10 the model-year code (49 CFR 565.15): R = 2024, S = 2025, P = 2023, N = 2022.
// The maker code (WMI, positions 1-3) "0ZT" is one no maker holds as far as we can tell: from memory, ISO 3780 /
// SAE give no region to a first character "0", so no WMI is assigned there (not checked against SAE's list).
// Makes and models are invented words no maker uses that we know of.
const JOBS: DemoJob[] = [
  {
    ro: "RO-24101",
    customer: { name: "Ines Marrow", email: "ines.marrow@example.invalid", phone: "555-0141" },
    vehicle: {
      vin: withCheckDigit("0ZTCT2A10RM104417"),
      year: 2024,
      make: "Corvane",
      model: "Tessel",
      plate: "KTR 2210",
    },
    task: { sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work", profileKey: "forward-radar" },
    drives: [{ pattern: "met", minutes: 18, daysAgo: 2, seed: 4101 }],
  },
  {
    ro: "RO-24102",
    customer: { name: "Oskar Lindgrove", email: "o.lindgrove@example.invalid", phone: "555-0172" },
    vehicle: {
      vin: withCheckDigit("0ZTHS4B10SM208833"),
      year: 2025,
      make: "Haldrane",
      model: "Stratell",
      plate: "PLV 0915",
    },
    task: {
      sensor: "forward_radar",
      method: "dynamic",
      reason: "removed_and_reinstalled",
      profileKey: "forward-radar",
    },
    drives: [{ pattern: "short", minutes: 9, daysAgo: 1, seed: 4102 }],
  },
  {
    ro: "RO-24103",
    customer: { name: "Perpetua Aldane", email: "p.aldane@example.invalid", phone: "555-0118" },
    vehicle: {
      vin: withCheckDigit("0ZTMV3C10PM331207"),
      year: 2023,
      make: "Mirrovel",
      model: "Vantrey",
      plate: "DKE 4471",
    },
    task: { sensor: "forward_camera", method: "dynamic", reason: "windshield_replaced", profileKey: "forward-camera" },
    drives: [{ pattern: "never-cleared", minutes: 31, daysAgo: 1, seed: 4103 }],
  },
  {
    ro: "RO-24104",
    customer: { name: "Benedikt Oyelaran", email: "b.oyelaran@example.invalid", phone: "555-0190" },
    vehicle: {
      vin: withCheckDigit("0ZTVP5D10RM412650"),
      year: 2024,
      make: "Ostrevane",
      model: "Pikett",
      plate: "RNM 7302",
    },
    task: { sensor: "forward_radar", method: "dynamic", reason: "replaced", profileKey: "forward-radar" },
    drives: [{ pattern: "harsh", minutes: 18, daysAgo: 0, seed: 4104 }],
  },
  {
    ro: "RO-24105",
    customer: { name: "Saoirse Kettleby", email: "s.kettleby@example.invalid", phone: "555-0133" },
    vehicle: {
      vin: withCheckDigit("0ZTKA2E10NM509981"),
      year: 2022,
      make: "Kestavon",
      model: "Ardell",
      plate: "TWB 1184",
    },
    task: { sensor: "corner_radar", method: "dynamic", reason: "bumper_or_grille_work", profileKey: "corner-radar" },
    drives: [{ pattern: "unverified", minutes: 17, daysAgo: 0, seed: 4105 }],
  },
  {
    ro: "RO-24098",
    customer: { name: "Tobiah Quennell", email: "t.quennell@example.invalid", phone: "555-0157" },
    vehicle: {
      vin: withCheckDigit("0ZTNW6F10SM611472"),
      year: 2025,
      make: "Norvantic",
      model: "Quillet",
      plate: "HJC 5529",
    },
    task: { sensor: "forward_radar", method: "dynamic", reason: "wheel_alignment", profileKey: "forward-radar" },
    drives: [
      {
        pattern: "short",
        minutes: 10,
        daysAgo: 9,
        seed: 4098,
        review: "redo",
        note: "Too little time behind a lead; use the ring road and follow at 120-150 ft.",
      },
      { pattern: "met", minutes: 20, daysAgo: 8, seed: 4099 },
    ],
  },
  {
    ro: "RO-24087",
    customer: { name: "Marisol Brackwater", email: "m.brackwater@example.invalid", phone: "555-0164" },
    vehicle: {
      vin: withCheckDigit("0ZTCT2A10PM702318"),
      year: 2023,
      make: "Corvane",
      model: "Tessel",
      plate: "GLX 8803",
    },
    task: { sensor: "rear_radar", method: "dynamic", reason: "bumper_or_grille_work", profileKey: "rear-radar" },
    drives: [
      {
        pattern: "harsh",
        minutes: 19,
        daysAgo: 20,
        seed: 4087,
        review: "approved",
        note: "Hard stop for a turning truck; the learn itself is fine.",
      },
    ],
  },
  {
    ro: "RO-24071",
    customer: { name: "Emeric Dunstable", email: "e.dunstable@example.invalid", phone: "555-0129" },
    vehicle: {
      vin: withCheckDigit("0ZTHS4B10RM803364"),
      year: 2024,
      make: "Haldrane",
      model: "Stratell",
      plate: "VQS 3317",
    },
    task: { sensor: "forward_radar", method: "dynamic", reason: "fault_code", profileKey: "forward-radar" },
    drives: [
      {
        pattern: "never-cleared",
        minutes: 12,
        daysAgo: 34,
        seed: 4071,
        review: "redo",
        note: "Never cleared; check the fault codes again before the next drive.",
      },
      { pattern: "met", minutes: 22, daysAgo: 33, seed: 4072 },
    ],
  },
]

export async function seedDemoJobsAndDrives(db: Db, shopId: string) {
  const people = await db
    .selectFrom("app_user")
    .select(["id", "role", "email", "name"])
    .where("shop_id", "=", shopId)
    .orderBy("email")
    .execute()
  const tech = people.find((p) => p.role === "technician")
  const codriver = people.find((p) => p.role === "co_driver")
  const lead = people.find((p) => p.role === "shop_lead") ?? people.find((p) => p.role === "admin")
  if (!tech || !lead) return
  const leads = people.filter((p) => p.role === "shop_lead")
  await seedOpenJobs(db, shopId, lead.id, tech.id)
  const existing = new Set(
    (
      await db
        .selectFrom("job")
        .select("ro_number")
        .where("shop_id", "=", shopId)
        .where(
          "ro_number",
          "in",
          JOBS.map((j) => j.ro),
        )
        .execute()
    ).map((r) => r.ro_number),
  )
  const profiles = await listProfiles(db, shopId)

  for (const demo of JOBS.filter((j) => !existing.has(j.ro))) {
    const profile = profiles.find((p) => p.key === demo.task.profileKey)
    const resolved = profile?.settings ?? resolveProfile()
    await db.transaction().execute(async (trx) => {
      const vehicle = await trx
        .insertInto("vehicle")
        .values({ shop_id: shopId, ...demo.vehicle })
        .returning("id")
        .executeTakeFirstOrThrow()
      const job = await trx
        .insertInto("job")
        .values({
          shop_id: shopId,
          ro_number: demo.ro,
          customer_name: demo.customer.name,
          customer_email: demo.customer.email,
          customer_phone: demo.customer.phone,
          vehicle_id: vehicle.id,
          created_by: lead.id,
          created_at: daysAgo(Math.max(...demo.drives.map((d) => d.daysAgo)) + 0.2),
        })
        .onConflict((oc) => oc.columns(["shop_id", "ro_number"]).doNothing())
        .returning("id")
        .executeTakeFirst()
      if (!job) return
      const task = await trx
        .insertInto("job_task")
        .values({
          shop_id: shopId,
          job_id: job.id,
          sensor: demo.task.sensor,
          method: demo.task.method,
          reason: demo.task.reason,
          profile_id: profile?.profileId ?? null,
        })
        .returning("id")
        .executeTakeFirstOrThrow()
      await trx
        .insertInto("checklist")
        .values({
          task_id: task.id,
          shop_id: shopId,
          data: JSON.stringify({
            faultCodes: { none: true, expected: [] },
            tires: { unit: "psi", placard: 35, fl: 35, fr: 35, rl: 34, rr: 35 },
            loadNormal: true,
            fuelLevel: "3/4",
            sensorClean: true,
            mountUndamaged: true,
            alignmentChecked: demo.task.reason === "wheel_alignment" ? true : null,
            notes: "Sensor cover wiped; no codes before the drive.",
          }),
          completed_by: tech.id,
        })
        .execute()

      let jobStatus: "complete" | "review" | "redo" = "complete"
      const vehicleWords = describeVehicle(demo.vehicle)
      for (const d of demo.drives) {
        const startMs = Math.floor(daysAgo(d.daysAgo).getTime() / 60_000) * 60_000
        const generated = generateDrive({
          seed: d.seed,
          pattern: d.pattern,
          minutes: d.minutes,
          startMs,
          profile: resolved,
        })
        const file = { ...generated, samples: generated.samples.map(storedSample) } // scored as stored
        const score = scoreDrive(file)
        const publicId = randomUUID()
        const driveId = internalDriveId(shopId, publicId)
        const needsReview = score.verdict !== "met" || score.harshEvents.accel + score.harshEvents.decel > 0
        const reviewStatus = d.review === "approved" ? "approved" : d.review === "redo" ? "redo" : null
        await trx
          .insertInto("drive")
          .values({
            id: driveId,
            public_id: publicId,
            shop_id: shopId,
            job_id: job.id,
            task_id: task.id,
            vehicle_description: null,
            profile_version_id: profile?.versionId ?? null,
            profile: JSON.stringify(resolved),
            driver_id: tech.id,
            co_driver_id: codriver?.id ?? null,
            status: "finished",
            verdict: score.verdict,
            review_status: reviewStatus,
            created_at: new Date(startMs),
            finished_at: new Date(score.endedAtMs ?? startMs),
          })
          .execute()
        await insertSamples(trx, driveId, shopId, file.samples)
        const loggedByCoDriver = new Set(["lead-on", "gap", "lead-off", "note"])
        await trx
          .insertInto("mark")
          .values(
            file.marks.map((m) =>
              markRow(m, {
                id: randomUUID(),
                driveId,
                shopId,
                createdBy: loggedByCoDriver.has(m.kind) && codriver ? codriver.id : tech.id,
              }),
            ),
          )
          .execute()
        await trx
          .insertInto("score")
          .values({ drive_id: driveId, shop_id: shopId, verdict: score.verdict, result: JSON.stringify(score) })
          .execute()
        const reviewedAt = new Date((score.endedAtMs ?? startMs) + 3 * 3_600_000)
        if (d.review && d.review !== "none") {
          await trx
            .insertInto("review")
            .values({
              shop_id: shopId,
              drive_id: driveId,
              decision: d.review === "approved" ? "approve" : "redo",
              note: d.note ?? "",
              reviewer_id: lead.id,
              created_at: reviewedAt,
            })
            .execute()
          if (d.review === "redo") {
            // As app/_server/review.ts words it: the notice leads to the job, where "Drive again" is the main action.
            await trx
              .insertInto("notification")
              .values({
                shop_id: shopId,
                user_id: tech.id,
                message: `${lead.name} sent back your drive (${demo.ro}, ${vehicleWords}): ${d.note ?? ""}`,
                link: `/jobs/${job.id}`,
                created_at: reviewedAt,
                read_at: reviewedAt,
              })
              .execute()
          }
        } else if (needsReview) {
          // A drive waiting for review has put a notice under each lead's bell (app/_server/review-notices.ts).
          for (const l of leads)
            await trx
              .insertInto("notification")
              .values({
                shop_id: shopId,
                user_id: l.id,
                message: `A drive waits for your review (${demo.ro}, ${vehicleWords}): ${VERDICT_WORD[score.verdict]}, driven by ${tech.name}.`,
                link: `/drives/${publicId}`,
                created_at: new Date(score.endedAtMs ?? startMs),
              })
              .execute()
        }
        jobStatus =
          reviewStatus === "redo" ? "redo" : reviewStatus === "approved" || !needsReview ? "complete" : "review"
      }
      await trx
        .updateTable("job")
        .set({ status: jobStatus })
        .where("id", "=", job.id)
        .where("shop_id", "=", shopId)
        .execute()
    })
  }
}

type OpenJob = {
  ro: string
  customer: { name: string; email: string; phone: string }
  vehicle: { vin: string; year: number; make: string; model: string; plate: string }
  tasks: Array<{
    sensor: string
    method: string
    reason: string
    profileKey: string | null
    checklist: Record<string, unknown> | null
  }>
}

const READY_CHECKLIST = {
  faultCodes: { none: false, expected: ["U0428"] },
  tires: { unit: "psi", placard: 36, fl: 36, fr: 36, rl: 35, rr: 36 },
  loadNormal: true,
  fuelLevel: "1/2",
  sensorClean: true,
  mountUndamaged: true,
  alignmentChecked: null,
  notes: "Bumper cover refitted; radar bracket inspected. U0428 (steering angle) expected until the learn.",
}

// Jobs waiting for their drive, so a technician signing in to the demo has something to start.
const OPEN_JOBS: OpenJob[] = [
  {
    ro: "RO-24110",
    customer: { name: "Wilhelmina Strand", email: "w.strand@example.invalid", phone: "555-0106" },
    vehicle: {
      vin: withCheckDigit("0ZTVP5D10SM120045"),
      year: 2025,
      make: "Ostrevane",
      model: "Pikett",
      plate: "MBE 6620",
    },
    tasks: [
      {
        sensor: "forward_radar",
        method: "dynamic",
        reason: "bumper_or_grille_work",
        profileKey: "forward-radar",
        checklist: READY_CHECKLIST,
      },
    ],
  },
  {
    ro: "RO-24111",
    customer: { name: "Caspian Thorne", email: "c.thorne@example.invalid", phone: "555-0187" },
    vehicle: {
      vin: withCheckDigit("0ZTMV3C10RM220318"),
      year: 2024,
      make: "Mirrovel",
      model: "Vantrey",
      plate: "ZRA 1043",
    },
    tasks: [
      {
        sensor: "forward_camera",
        method: "dynamic",
        reason: "windshield_replaced",
        profileKey: "forward-camera",
        checklist: null,
      },
      {
        sensor: "forward_radar",
        method: "dynamic",
        reason: "windshield_replaced",
        profileKey: "forward-radar",
        checklist: { ...READY_CHECKLIST, tires: { unit: "psi", placard: 35, fl: 35, fr: 35, rl: 29, rr: 35 } },
      },
    ],
  },
]

async function seedOpenJobs(db: Db, shopId: string, createdBy: string, completedBy: string) {
  const existing = new Set(
    (
      await db
        .selectFrom("job")
        .select("ro_number")
        .where("shop_id", "=", shopId)
        .where(
          "ro_number",
          "in",
          OPEN_JOBS.map((j) => j.ro),
        )
        .execute()
    ).map((r) => r.ro_number),
  )
  const profiles = await db
    .selectFrom("condition_profile")
    .select(["id", "key"])
    .where("shop_id", "=", shopId)
    .execute()
  for (const demo of OPEN_JOBS.filter((j) => !existing.has(j.ro))) {
    await db.transaction().execute(async (trx) => {
      const vehicle = await trx
        .insertInto("vehicle")
        .values({ shop_id: shopId, ...demo.vehicle })
        .returning("id")
        .executeTakeFirstOrThrow()
      const job = await trx
        .insertInto("job")
        .values({
          shop_id: shopId,
          ro_number: demo.ro,
          customer_name: demo.customer.name,
          customer_email: demo.customer.email,
          customer_phone: demo.customer.phone,
          vehicle_id: vehicle.id,
          created_by: createdBy,
        })
        .returning("id")
        .executeTakeFirstOrThrow()
      for (const t of demo.tasks) {
        const task = await trx
          .insertInto("job_task")
          .values({
            shop_id: shopId,
            job_id: job.id,
            sensor: t.sensor,
            method: t.method,
            reason: t.reason,
            profile_id: profiles.find((p) => p.key === t.profileKey)?.id ?? null,
          })
          .returning("id")
          .executeTakeFirstOrThrow()
        if (t.checklist) {
          await trx
            .insertInto("checklist")
            .values({ task_id: task.id, shop_id: shopId, data: JSON.stringify(t.checklist), completed_by: completedBy })
            .execute()
        }
      }
    })
  }
}

function daysAgo(days: number) {
  return new Date(Date.now() - days * 86_400_000 - 2 * 3_600_000)
}
