"use client"

import { useQuery } from "@tanstack/react-query"
import { CircleAlert, CircleCheck, Pencil, Play, RotateCcw } from "lucide-react"
import Link from "next/link"
import { VerdictBadge, type Verdict } from "@/components/drives/verdict-badge"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { LocalTime } from "@/components/ui/local-time"
import { METHOD_LABEL, REASON_LABEL, SENSOR_LABEL, type Method, type Reason, type Sensor } from "@/lib/validation/job"
import { apiFetch } from "@/lib/api/client"
import { ChecklistForm, type ChecklistView } from "./checklist-form"
import { JobStatusBadge } from "./job-status"
import { PhotoUpload, type AttachmentView } from "./photo-upload"
import { SetupForm } from "./setup-form"

export type JobView = {
  id: string
  roNumber: string
  status: string
  customer: { name: string; email: string | null; phone: string | null }
  vehicle: {
    id: string
    vin: string
    year: number | null
    make: string | null
    model: string | null
    plate: string | null
  }
  tasks: {
    id: string
    sensor: string
    method: string
    reason: string
    profile: { id: string; key: string; name: string; version: number; versionId: string } | null
    checklist: ChecklistView | null
  }[]
  attachments: AttachmentView[]
  drives: {
    id: string
    taskId: string | null
    status: string
    verdict: string | null
    reviewStatus: string | null
    createdAt: string
    finishedAt: string | null
  }[]
  settings: { units: "imperial" | "metric"; tirePressureTolerancePsi: number }
}

export function JobDetail({
  initialJob,
  canEdit,
  isLead = false,
}: {
  initialJob: JobView
  canEdit: boolean
  isLead?: boolean
}) {
  const { data } = useQuery({
    queryKey: ["job", initialJob.id],
    queryFn: async () => (await apiFetch<{ job: JobView }>(`/api/jobs/${initialJob.id}`)).job,
    initialData: initialJob,
  })
  const job = data
  const v = job.vehicle
  return (
    <div className="space-y-4">
      <Card className="space-y-2">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <JobStatusBadge status={job.status} />
          {canEdit ? (
            <Link href={`/jobs/${job.id}/edit`} className={buttonVariants({ variant: "outline", size: "sm" })}>
              <Pencil aria-hidden className="size-4" /> Edit
            </Link>
          ) : null}
        </div>
        <dl className="grid gap-x-6 gap-y-1 sm:grid-cols-2">
          <div>
            <dt className="text-sm text-graphite-600 dark:text-graphite-300">Customer</dt>
            <dd className="font-medium">
              {job.customer.name}
              {job.customer.phone ? <span className="block text-sm font-normal">{job.customer.phone}</span> : null}
              {job.customer.email ? <span className="block text-sm font-normal">{job.customer.email}</span> : null}
            </dd>
          </div>
          <div>
            <dt className="text-sm text-graphite-600 dark:text-graphite-300">Vehicle</dt>
            <dd className="font-medium">
              {[v.year, v.make, v.model].filter(Boolean).join(" ") || "—"}
              {v.plate ? ` · ${v.plate}` : ""}
              <span className="block font-mono text-sm font-normal tracking-wider" data-testid="job-vin">
                {v.vin}
              </span>
            </dd>
          </div>
        </dl>
      </Card>

      {job.tasks.map((task, i) => {
        const drives = job.drives.filter((d) => d.taskId === task.id)
        const photos = job.attachments.filter((a) => a.taskId === task.id)
        // A static task has no drive learn, but its road test is a drive too (issue 13).
        const drivable = true
        const ready = task.checklist?.ready === true
        return (
          <Card key={task.id} className="space-y-4" data-testid={`task-card-${i}`}>
            <header className="space-y-1">
              <h2 className="text-lg font-bold">
                {SENSOR_LABEL[task.sensor as Sensor] ?? task.sensor} ·{" "}
                {METHOD_LABEL[task.method as Method] ?? task.method}
              </h2>
              <p className="text-sm text-graphite-600 dark:text-graphite-300">
                {REASON_LABEL[task.reason as Reason] ?? task.reason}
                {task.profile
                  ? ` · held to ${task.profile.name} (version ${task.profile.version})`
                  : drivable
                    ? " · default conditions"
                    : ""}
              </p>
            </header>

            <section aria-label={`Checklist for calibration ${i + 1}`} className="space-y-2">
              <h3 className="flex items-center gap-2 font-semibold">
                {ready ? (
                  <CircleCheck aria-hidden className="size-5 text-teal-600" />
                ) : (
                  <CircleAlert aria-hidden className="size-5 text-signal-600" />
                )}
                Before the drive: {task.checklist ? (ready ? "ready" : "not ready yet") : "not filled in"}
              </h3>
              {task.checklist ? (
                <p className="text-sm text-graphite-600 dark:text-graphite-300" data-testid="checklist-stamp">
                  Saved by {task.checklist.completedBy ?? "someone no longer here"} on{" "}
                  <LocalTime iso={task.checklist.completedAt} />
                </p>
              ) : null}
              <ChecklistForm
                jobId={job.id}
                task={task}
                saved={task.checklist}
                tolerancePsi={job.settings.tirePressureTolerancePsi}
                metric={job.settings.units === "metric"}
                canEdit={canEdit}
              />
            </section>

            {task.method !== "dynamic" ? (
              <section aria-label={`Target set-up for calibration ${i + 1}`} className="space-y-2">
                <h3 className="font-semibold">Target set-up measurements</h3>
                <SetupForm jobId={job.id} taskId={task.id} canEdit={canEdit} isLead={isLead} index={i} />
              </section>
            ) : null}

            <section aria-label={`Photos for calibration ${i + 1}`} className="space-y-2">
              <h3 className="font-semibold">Photos and printouts</h3>
              <PhotoUpload jobId={job.id} taskId={task.id} attachments={photos} canUpload={canEdit} />
            </section>

            {drivable ? (
              <section className="space-y-2">
                {ready ? (
                  <Link
                    href={`/record?jobId=${job.id}&taskId=${task.id}`}
                    className={buttonVariants({ variant: "signal", size: "lg" })}
                    data-testid="start-drive"
                  >
                    {job.status === "redo" && drives.length ? (
                      <>
                        <RotateCcw aria-hidden className="size-5" /> Drive again
                      </>
                    ) : (
                      <>
                        <Play aria-hidden className="size-5" />{" "}
                        {task.method === "static" ? "Start the road test" : "Start a drive"}
                      </>
                    )}
                  </Link>
                ) : (
                  <p className="text-sm font-medium">Save a checklist with every check passing to start a drive.</p>
                )}
                {drives.length ? (
                  <ul className="divide-y divide-graphite-100 dark:divide-asphalt-700">
                    {drives.map((d) => (
                      <li key={d.id} className="flex min-h-12 items-center justify-between gap-2">
                        <Link href={`/drives/${d.id}`} className="underline-offset-4 hover:underline">
                          Drive of <LocalTime iso={d.createdAt} />
                        </Link>
                        {d.verdict ? (
                          <VerdictBadge verdict={d.verdict as Verdict} />
                        ) : (
                          <span className="text-sm">{d.status === "recording" ? "Recording" : "Finished"}</span>
                        )}
                      </li>
                    ))}
                  </ul>
                ) : null}
                <p className="text-xs text-graphite-600 dark:text-graphite-300">
                  A drive&apos;s score is a record of the conditions, not proof of the calibration: the vehicle&apos;s
                  own confirmation decides.
                </p>
              </section>
            ) : null}
          </Card>
        )
      })}

      {job.attachments.some((a) => !a.taskId) ? (
        <Card className="space-y-2">
          <h2 className="font-semibold">Other files</h2>
          <PhotoUpload
            jobId={job.id}
            taskId={null}
            attachments={job.attachments.filter((a) => !a.taskId)}
            canUpload={false}
          />
        </Card>
      ) : null}
    </div>
  )
}
