"use client"
import { ArrowLeft, CarFront, ClipboardList, Users } from "lucide-react"
import { lazy, Suspense, useEffect, useState } from "react"
import { SENSOR_LABEL as SENSOR_WORD } from "@/lib/labels"
import { DEFAULT_PROFILE, resolveProfile } from "@/lib/drive-file/profile"
import type { Profile } from "@/lib/drive-file/schema"
import { profileInWords } from "@/lib/recorder/profile-words"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { AfterIdle, afterIdle } from "@/components/ui/after-idle"
import { Bullets } from "@/components/ui/bullets"
import { apiFetch } from "@/lib/api/client"
import { GATE_CHECKS } from "@/lib/recorder/gate-checks"
import type { DriveStart } from "@/lib/recorder/recorder"
import type { ChecklistSummary } from "./start-gate"

type JobSummary = { id: string; roNumber: string; label: string }
type TaskSummary = {
  id: string
  sensor: string
  method: string
  profile: { name: string; settings: Profile } | null
  checklist: ChecklistSummary | null
}
type Person = { id: string; name: string }

export type StartChoice = DriveStart

const OPEN_JOB_STATUSES = new Set(["open", "drive", "redo"])

// Off the first screen's path: the road hint shows once the page is idle, and the gate (the second step) loads
// then too, so that the first screen works with less code (the worker has both cached for offline use).
const GoodRoadsNow = lazy(() => import("@/components/roads/good-roads-now").then((m) => ({ default: m.GoodRoadsNow })))
const loadGate = () => import("./start-gate").then((m) => ({ default: m.StartGate }))
const StartGate = lazy(loadGate)

/** What the start screen reads, or null offline or refused (it then offers an unplanned drive). */
function getJson<T>(path: string): Promise<T | null> {
  return apiFetch<T>(path).catch(() => null)
}

/** A job as GET /api/jobs lists it (the fields the start screen reads). */
type ListedJob = {
  id: string
  status: string
  roNumber?: string
  ro_number?: string
  vehicle?: { year?: number | null; make?: string | null; model?: string | null } | null
}

function jobLabel(j: ListedJob): string {
  const v = j.vehicle ?? {}
  const car = [v.year, v.make, v.model].filter(Boolean).join(" ")
  return `${j.roNumber ?? j.ro_number ?? "RO"}${car ? ` · ${car}` : ""}`
}

/** Pick the job and task (or an unplanned drive), read the profile, pass the pre-drive gate, start. */
export function StartFlow({ onStart }: { onStart: (choice: StartChoice) => void }) {
  const { units } = useFormatPrefs()
  const [jobs, setJobs] = useState<JobSummary[] | null>(null)
  const [jobId, setJobId] = useState<string>("")
  const [tasks, setTasks] = useState<TaskSummary[]>([])
  const [taskId, setTaskId] = useState<string>("")
  const [unplanned, setUnplanned] = useState("")
  const [checks, setChecks] = useState<Record<string, boolean>>({})
  const [ready, setReady] = useState(false)
  const [step, setStep] = useState<"pick" | "gate">("pick")
  const [coDrivers, setCoDrivers] = useState<Person[]>([])
  const [coDriverId, setCoDriverId] = useState("")
  // A job page's "Start a drive" link names the job and task: /record?jobId=...&taskId=...
  const [wanted] = useState(() => {
    const q = new URLSearchParams(typeof window === "undefined" ? "" : window.location.search)
    return { jobId: q.get("jobId") ?? "", taskId: q.get("taskId") ?? "" }
  })

  useEffect(() => {
    void afterIdle().then(loadGate)
  }, [])

  useEffect(() => {
    void getJson<{ jobs?: ListedJob[] }>("/api/jobs?limit=100&sort=updatedAt&dir=desc").then((body) => {
      const list = Array.isArray(body?.jobs) ? body.jobs : []
      const open = list.filter((j) => OPEN_JOB_STATUSES.has(j.status) || j.id === wanted.jobId)
      setJobs(open.map((j) => ({ id: j.id, roNumber: j.roNumber ?? j.ro_number ?? "", label: jobLabel(j) })))
      if (wanted.jobId && open.some((j) => j.id === wanted.jobId)) setJobId(wanted.jobId)
    })
    void getJson<{ people?: Person[] }>("/api/people?role=co_driver").then((body) =>
      setCoDrivers(Array.isArray(body?.people) ? body.people : []),
    )
  }, [wanted.jobId])

  // Another job's tasks are forgotten the moment the job changes (during render), then its own are fetched.
  const [tasksOf, setTasksOf] = useState("")
  if (tasksOf !== jobId) {
    setTasksOf(jobId)
    setTasks([])
    setTaskId("")
  }
  useEffect(() => {
    if (!jobId) return
    let live = true
    void getJson<{ job?: { tasks?: TaskSummary[] } }>(`/api/jobs/${jobId}`).then((body) => {
      if (!live) return
      // Static tasks too: their road test is a drive.
      const t: TaskSummary[] = body?.job?.tasks ?? []
      setTasks(t)
      const preferred = t.find((x) => x.id === wanted.taskId) ?? (t.length === 1 ? t[0] : undefined)
      if (preferred) setTaskId(preferred.id)
    })
    return () => {
      live = false
    }
  }, [jobId, wanted.taskId])

  const checklist = tasks.find((t) => t.id === taskId)?.checklist ?? null
  // What the job's checklist already confirmed is ticked; the technician still sees and can untick each line.
  const [checksFrom, setChecksFrom] = useState<typeof checklist>(null)
  if (checklist !== checksFrom) {
    setChecksFrom(checklist)
    if (checklist && !checklist.blockers.some((b) => b.key === "checklist")) {
      setChecks(
        Object.fromEntries(
          GATE_CHECKS.map((c) => [
            c.key,
            !checklist.blockers.some((b) => b.key === c.blocker || b.key.startsWith(`${c.blocker}.`)),
          ]),
        ),
      )
    }
  }

  const task = tasks.find((t) => t.id === taskId) ?? null
  const profile = task?.profile ? resolveProfile(task.profile.settings) : resolveProfile(DEFAULT_PROFILE)
  const job = jobs?.find((j) => j.id === jobId)
  const canGoOn = jobId ? Boolean(taskId) : unplanned.trim().length > 2
  const allChecked = GATE_CHECKS.every((c) => checks[c.key]) && ready

  if (step === "pick") {
    return (
      <div className="space-y-4">
        <div className="flex items-center justify-between gap-2">
          <h1 className="text-2xl font-bold">Start a drive</h1>
          <a
            href="/drives"
            className="flex min-h-12 items-center gap-1 rounded-lg px-3 font-semibold text-graphite-200 hover:bg-asphalt-700"
          >
            <ArrowLeft aria-hidden className="size-5" /> Drives
          </a>
        </div>
        <AfterIdle>
          <GoodRoadsNow />
        </AfterIdle>
        <section className="space-y-2 rounded-xl bg-asphalt-800 p-3">
          <h2 className="flex items-center gap-2 font-semibold">
            <ClipboardList aria-hidden className="size-5" /> Job
          </h2>
          {jobs === null ? (
            <p className="text-graphite-300">Loading jobs…</p>
          ) : jobs.length === 0 ? (
            <p className="text-graphite-300">No open jobs here (or no network). Start an unplanned drive below.</p>
          ) : (
            <Picker
              label="Job"
              value={jobId}
              onChange={setJobId}
              blank="Choose a job…"
              items={jobs}
              word={(j) => j.label}
            />
          )}
          {tasks.length > 1 ? (
            <Picker
              label="Task"
              value={taskId}
              onChange={setTaskId}
              blank="Choose the calibration…"
              items={tasks}
              word={(t) => `${SENSOR_WORD[t.sensor] ?? t.sensor} (${t.method})`}
            />
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
        {coDrivers.length ? (
          <section className="space-y-2 rounded-xl bg-asphalt-800 p-3">
            <h2 className="flex items-center gap-2 font-semibold">
              <Users aria-hidden className="size-5" /> Co-driver
            </h2>
            <Picker
              label="Co-driver"
              value={coDriverId}
              onChange={setCoDriverId}
              blank="Logs on this phone"
              items={coDrivers}
              word={(p) => `${p.name} (on their own phone)`}
            />
          </section>
        ) : null}
        <section className="rounded-xl bg-asphalt-800 p-3">
          <h2 className="font-semibold">
            Condition profile{task?.profile ? `: ${task.profile.name}` : ": shop default"}
          </h2>
          <Bullets className="mt-2 list-disc space-y-1 pl-5 text-graphite-200" items={profileInWords(profile, units)} />
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
        {!canGoOn ? (
          <p className="text-center text-sm text-graphite-300">
            {jobId
              ? "Choose the calibration to drive for."
              : "Choose a job, or name the vehicle for an unplanned drive."}
          </p>
        ) : null}
      </div>
    )
  }

  return (
    <Suspense fallback={<p className="text-graphite-300">Opening the checks…</p>}>
      <StartGate
        checklist={checklist}
        jobChosen={Boolean(jobId)}
        checks={checks}
        onCheck={(key, on) => setChecks({ ...checks, [key]: on })}
        ready={ready}
        onReady={setReady}
        canStart={allChecked}
        onBack={() => setStep("pick")}
        onStart={() =>
          onStart({
            profile,
            label: job ? job.label : unplanned.trim(),
            vehicleDescription: job ? null : unplanned.trim(),
            jobId: jobId || null,
            taskId: taskId || null,
            coDriverId: coDriverId || null,
          })
        }
      />
    </Suspense>
  )
}

/** A start-screen choice: a first blank option saying what to choose, then one option per item. */
function Picker<T extends { id: string }>({
  label,
  value,
  onChange,
  blank,
  items,
  word,
}: {
  label: string
  value: string
  onChange: (id: string) => void
  blank: string
  items: readonly T[]
  word: (item: T) => string
}) {
  return (
    <select
      aria-label={label}
      className="min-h-12 w-full rounded-lg bg-asphalt-700 px-3"
      value={value}
      onChange={(e) => onChange(e.target.value)}
    >
      <option value="">{blank}</option>
      {items.map((item) => (
        <option key={item.id} value={item.id}>
          {word(item)}
        </option>
      ))}
    </select>
  )
}
