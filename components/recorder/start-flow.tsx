"use client"
import { CarFront, ClipboardList, Play, ShieldAlert } from "lucide-react"
import { useEffect, useState } from "react"
import { DEFAULT_PROFILE, resolveProfile, type ResolvedProfile } from "@/lib/drive-file/profile"
import type { Profile } from "@/lib/drive-file/schema"
import { profileInWords } from "@/lib/recorder/profile-words"

type JobSummary = { id: string; roNumber: string; label: string }
type TaskSummary = { id: string; sensor: string; method: string; profile: { name: string; settings: Profile } | null; checklist: Record<string, unknown> | null }

export interface StartChoice {
  profile: ResolvedProfile
  label: string
  vehicleDescription: string | null
  jobId: string | null
  taskId: string | null
}

const GATE_CHECKS = [
  { key: "codes", text: "No stored fault codes other than the ones expected for this repair." },
  { key: "tires", text: "Tire pressures set to the placard." },
  { key: "load", text: "No unusual load in the vehicle." },
  { key: "clean", text: "Sensor face and the area in front of it clean." },
  { key: "mount", text: "Sensor mount and bracket undamaged." },
] as const

const CAUTIONS = [
  "The driver never operates the phone while the vehicle moves: the co-driver logs.",
  "Obey traffic law and drive for the road and traffic; no learn is worth a risk.",
  "The vehicle maker's service information and local regulations come first.",
  "The vehicle's own confirmation that the learn is done governs. The score never replaces it.",
]

const SENSOR_WORD: Record<string, string> = {
  forward_radar: "Forward radar",
  forward_camera: "Forward camera",
  corner_radar: "Corner radar",
  rear_radar: "Rear radar",
  surround_camera: "Surround camera",
  other: "Other sensor",
}

async function getJson(path: string): Promise<any | null> {
  try {
    const res = await fetch(path, { credentials: "same-origin" })
    if (!res.ok) return null
    return await res.json()
  } catch {
    return null
  }
}

function jobLabel(j: any): string {
  const v = j.vehicle ?? {}
  const car = [v.year, v.make, v.model].filter(Boolean).join(" ")
  return `${j.roNumber ?? j.ro_number ?? "RO"}${car ? ` · ${car}` : ""}`
}

/** Pick the job and task (or an unplanned drive), read the profile, pass the pre-drive gate, start. */
export function StartFlow({ onStart }: { onStart: (choice: StartChoice) => void }) {
  const [jobs, setJobs] = useState<JobSummary[] | null>(null)
  const [jobId, setJobId] = useState<string>("")
  const [tasks, setTasks] = useState<TaskSummary[]>([])
  const [taskId, setTaskId] = useState<string>("")
  const [unplanned, setUnplanned] = useState("")
  const [checks, setChecks] = useState<Record<string, boolean>>({})
  const [ready, setReady] = useState(false)
  const [step, setStep] = useState<"pick" | "gate">("pick")

  useEffect(() => {
    void getJson("/api/jobs").then((body) => {
      const list = Array.isArray(body?.jobs) ? body.jobs : []
      setJobs(
        list
          .filter((j: any) => !["complete", "review"].includes(j.status))
          .map((j: any) => ({ id: j.id, roNumber: j.roNumber ?? j.ro_number, label: jobLabel(j) })),
      )
    })
  }, [])

  useEffect(() => {
    setTasks([])
    setTaskId("")
    if (!jobId) return
    void getJson(`/api/jobs/${jobId}`).then((body) => {
      const t: TaskSummary[] = (body?.job?.tasks ?? []).filter((x: any) => x.method !== "static")
      setTasks(t)
      if (t.length === 1) setTaskId(t[0]!.id)
    })
  }, [jobId])

  const task = tasks.find((t) => t.id === taskId) ?? null
  const profile = task?.profile ? resolveProfile(task.profile.settings) : resolveProfile(DEFAULT_PROFILE)
  const job = jobs?.find((j) => j.id === jobId)
  const canGoOn = jobId ? Boolean(taskId) : unplanned.trim().length > 2
  const allChecked = GATE_CHECKS.every((c) => checks[c.key]) && ready

  if (step === "pick") {
    return (
      <div className="space-y-4">
        <h1 className="text-2xl font-bold">Start a drive</h1>
        <section className="space-y-2 rounded-xl bg-asphalt-800 p-3">
          <h2 className="flex items-center gap-2 font-semibold">
            <ClipboardList aria-hidden className="size-5" /> Job
          </h2>
          {jobs === null ? (
            <p className="text-graphite-300">Loading jobs…</p>
          ) : jobs.length === 0 ? (
            <p className="text-graphite-300">No open jobs here (or no network). Start an unplanned drive below.</p>
          ) : (
            <select aria-label="Job" className="min-h-12 w-full rounded-lg bg-asphalt-700 px-3" value={jobId} onChange={(e) => setJobId(e.target.value)}>
              <option value="">Choose a job…</option>
              {jobs.map((j) => (
                <option key={j.id} value={j.id}>
                  {j.label}
                </option>
              ))}
            </select>
          )}
          {tasks.length > 1 ? (
            <select aria-label="Task" className="min-h-12 w-full rounded-lg bg-asphalt-700 px-3" value={taskId} onChange={(e) => setTaskId(e.target.value)}>
              <option value="">Choose the calibration…</option>
              {tasks.map((t) => (
                <option key={t.id} value={t.id}>
                  {SENSOR_WORD[t.sensor] ?? t.sensor} ({t.method})
                </option>
              ))}
            </select>
          ) : null}
        </section>
        {!jobId ? (
          <section className="space-y-2 rounded-xl bg-asphalt-800 p-3">
            <h2 className="flex items-center gap-2 font-semibold">
              <CarFront aria-hidden className="size-5" /> Unplanned drive
            </h2>
            <label className="block">
              <span className="text-sm text-graphite-300">Vehicle (year, make, model, colour or plate)</span>
              <input
                value={unplanned}
                onChange={(e) => setUnplanned(e.target.value)}
                className="mt-1 min-h-12 w-full rounded-lg bg-asphalt-700 px-3"
                data-testid="vehicle-description"
              />
            </label>
          </section>
        ) : null}
        <section className="rounded-xl bg-asphalt-800 p-3">
          <h2 className="font-semibold">Condition profile{task?.profile ? `: ${task.profile.name}` : ": shop default"}</h2>
          <ul className="mt-2 list-disc space-y-1 pl-5 text-graphite-200">
            {profileInWords(profile).map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </section>
        <button
          type="button"
          disabled={!canGoOn}
          onClick={() => setStep("gate")}
          className="min-h-14 w-full rounded-xl bg-signal-400 text-lg font-bold text-graphite-950 disabled:opacity-40"
          data-testid="to-gate"
        >
          Next: before you drive
        </button>
      </div>
    )
  }

  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Before you drive</h1>
      <section className="space-y-1 rounded-xl bg-asphalt-800 p-3">
        {GATE_CHECKS.map((c) => (
          <label key={c.key} className="flex min-h-12 items-center gap-3">
            <input type="checkbox" className="size-6 accent-signal-400" checked={Boolean(checks[c.key])} onChange={(e) => setChecks({ ...checks, [c.key]: e.target.checked })} data-testid={`gate-${c.key}`} />
            <span>{c.text}</span>
          </label>
        ))}
      </section>
      <section className="space-y-1 rounded-xl border-2 border-signal-400 p-3" data-testid="cautions">
        <h2 className="flex items-center gap-2 font-semibold text-signal-300">
          <ShieldAlert aria-hidden className="size-5" /> Safety
        </h2>
        <ul className="list-disc space-y-1 pl-5">
          {CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </section>
      <label className="flex min-h-12 items-center gap-3 rounded-xl bg-asphalt-800 p-3 font-semibold">
        <input type="checkbox" className="size-6 accent-signal-400" checked={ready} onChange={(e) => setReady(e.target.checked)} data-testid="gate-ready" />
        The vehicle is out of the bay, running and ready to drive.
      </label>
      <div className="grid grid-cols-3 gap-2">
        <button type="button" onClick={() => setStep("pick")} className="min-h-16 rounded-xl bg-asphalt-700 font-semibold">
          Back
        </button>
        <button
          type="button"
          disabled={!allChecked}
          data-testid="start-drive"
          onClick={() =>
            onStart({
              profile,
              label: job ? job.label : unplanned.trim(),
              vehicleDescription: job ? null : unplanned.trim(),
              jobId: jobId || null,
              taskId: taskId || null,
            })
          }
          className="col-span-2 flex min-h-16 items-center justify-center gap-2 rounded-xl bg-signal-400 text-xl font-bold text-graphite-950 disabled:opacity-40"
        >
          <Play aria-hidden /> Start
        </button>
      </div>
    </div>
  )
}
