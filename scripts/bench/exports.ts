// exportPeakRssMb360k: the app server's peak resident memory (MB of 1,000,000 bytes) while one signed-in user
// downloads a finished 360,000-sample drive (10 h at 10 Hz) as GPX, CSV and the drive file, one after the other.
// The drive is stored straight into the database (an import would itself raise the server's memory first); the
// server's peak is reset just before the downloads (writing 5 to /proc/PID/clear_refs resets VmHWM) and read
// after them, with VmRSS polled every 25 ms as a floor. Needs the running app (BASE_URL), its database
// (DATABASE_URL) and the server's process id (BENCH_SERVER_PID, which `npm run bench` sets for its own stack).
import fs from "node:fs"
import { insertSamples } from "@/db/queries/samples"
import { generateDrive } from "@/lib/tracks"
import { benchDriveRow, benchMarks, benchPerson, benchStack, signInCookie } from "./rig"
import { APP_ENV, atMost, benchFigure } from "./types"

const SAMPLES = 360_000

/** The process and everything it started (`next start` may serve from a child). */
function processTree(pid: number): number[] {
  const all = [pid]
  for (let i = 0; i < all.length; i++) {
    try {
      const children = fs.readFileSync(`/proc/${all[i]}/task/${all[i]}/children`, "utf8").trim()
      if (children) all.push(...children.split(/\s+/).map(Number))
    } catch {}
  }
  return all
}

function statusKb(pid: number, field: "VmRSS" | "VmHWM"): number {
  try {
    const m = new RegExp(`^${field}:\\s+(\\d+) kB`, "m").exec(fs.readFileSync(`/proc/${pid}/status`, "utf8"))
    return m ? Number(m[1]) : 0
  } catch {
    return 0
  }
}

export const exportPeakRssMb360k = benchFigure(
  "exportPeakRssMb360k",
  atMost(300, "MB"),
  [...APP_ENV, "BENCH_SERVER_PID"],
  async (ctx) => {
    const { baseUrl, db, shopId, cleanup } = await benchStack(ctx.env, "exports")
    try {
      const person = await benchPerson(db, shopId, "technician")
      const file = generateDrive({ seed: 360, minutes: SAMPLES / 600, hz: 10, pattern: "met" })
      if (file.samples.length !== SAMPLES) throw new Error(`generated ${file.samples.length} samples, not ${SAMPLES}`)
      const drive = await benchDriveRow(db, shopId, person.id, file.samples[0]!.t, file.profile)
      for (let i = 0; i < SAMPLES; i += 10_000)
        await insertSamples(db, drive.id, shopId, file.samples.slice(i, i + 10_000))
      await benchMarks(db, drive.id, shopId, file.marks)

      const cookie = await signInCookie(baseUrl, person, `bench-exports-${process.pid}`)

      const pids = processTree(Number(ctx.env.BENCH_SERVER_PID))
      let reset = true
      for (const pid of pids) {
        try {
          fs.writeFileSync(`/proc/${pid}/clear_refs`, "5")
        } catch {
          reset = false
        }
      }
      const beforeKb = Math.max(...pids.map((pid) => statusKb(pid, "VmRSS")))
      let polledKb = 0
      const poll = setInterval(() => {
        for (const pid of pids) polledKb = Math.max(polledKb, statusKb(pid, "VmRSS"))
      }, 25)
      const sizes: string[] = []
      try {
        for (const format of ["gpx", "csv", "drive"]) {
          const res = await fetch(`${baseUrl}/api/drives/${drive.public_id}/file?format=${format}`, {
            headers: { cookie },
          })
          if (!res.ok) throw new Error(`${format} export failed: ${res.status}`)
          let bytes = 0
          let newlines = 0
          for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
            bytes += chunk.length
            for (const b of chunk) if (b === 10) newlines++
          }
          if (format === "csv" && newlines !== SAMPLES + 1)
            throw new Error(`the CSV has ${newlines} lines, not ${SAMPLES + 1}`)
          sizes.push(
            `${format} ${(bytes / 1e6).toFixed(1)} MB (peak so far ${((polledKb * 1024) / 1e6).toFixed(0)} MB)`,
          )
        }
      } finally {
        clearInterval(poll)
      }
      const hwmKb = Math.max(...pids.map((pid) => statusKb(pid, "VmHWM")))
      console.error(
        `[bench] exports of ${SAMPLES} samples (${sizes.join(", ")}); server processes ${pids.join(",")}: ${((beforeKb * 1024) / 1e6).toFixed(0)} MB before the downloads, polled peak ${((polledKb * 1024) / 1e6).toFixed(0)} MB, VmHWM ${reset ? "after reset" : "NOT reset (no access to clear_refs)"} ${((hwmKb * 1024) / 1e6).toFixed(0)} MB`,
      )
      return (Math.max(reset ? hwmKb : 0, polledKb) * 1024) / 1e6
    } finally {
      await cleanup()
    }
  },
)
