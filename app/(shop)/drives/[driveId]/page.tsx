import { Download, Radio, RotateCcw, ShieldAlert, Wrench } from "lucide-react"
import Link from "next/link"
import type { Metadata } from "next"
import { notFound } from "next/navigation"
import { requirePageRole } from "@/app/_server/auth"
import { loadRecordData } from "@/app/_server/record-data"
import { SpeedChart, type ChartMark, type Stretch } from "@/components/charts/speed-chart"
import { LiveDrive } from "@/components/drives/live-drive"
import { CalibrationsSection } from "@/components/record/calibrations-section"
import { RecordSummary } from "@/components/record/record-summary"
import { RevisionHistory } from "@/components/record/revision-history"
import { TrackSvg } from "@/components/record/track-svg"
import { MarkTimeline } from "@/components/review/mark-timeline"
import { RecordActions } from "@/components/review/record-actions"
import { ReviewActions } from "@/components/review/review-actions"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { PageHeader } from "@/components/ui/page-header"
import { getDb } from "@/db/client"
import { listRecordPhotos } from "@/db/queries/reviews"
import { listRevisions } from "@/db/queries/revisions"
import { CAUSE_TEXT } from "@/app/_server/revisions"
import { canSeeDrive } from "@/lib/access/drive"
import { internalDriveId } from "@/lib/drive-id"
import { hasRole } from "@/lib/auth/roles"
import {
  DECISION_WORD,
  describeVehicle,
  roLabel,
  MARK_LABEL,
  METHOD_LABEL,
  REASON_LABEL,
  SENSOR_LABEL,
} from "@/lib/record"
import { downsampleTimeline } from "@/lib/record/downsample"
import { isUuid } from "@/lib/validation/uuid"

export const metadata: Metadata = { title: "Drive" }
export const dynamic = "force-dynamic"

export default async function DrivePage({ params }: { params: Promise<{ driveId: string }> }) {
  const me = await requirePageRole()
  const { driveId } = await params
  if (!isUuid(driveId)) notFound()
  const db = getDb()
  // The address holds the public id; the shop's drive with it has this internal id (lib/drive-id.ts).
  const loaded = await loadRecordData(db, internalDriveId(me.shopId, driveId), me.shopId, { photos: false })
  if (!loaded) notFound()
  const { head, data } = loaded
  const facts = {
    shopId: head.shop_id,
    driverId: head.driver_id,
    coDriverId: head.co_driver_id,
    status: head.status,
    reviewStatus: head.review_status,
  }
  if (!canSeeDrive(me, facts)) notFound()
  const isLead = hasRole(me.role, ["shop_lead"])
  const title = head.ro_number ? roLabel(head.ro_number) : "Unplanned drive"
  const vehicle = describeVehicle(
    head.vin ? { year: head.vehicle_year, make: head.vehicle_make, model: head.vehicle_model } : null,
    head.vehicle_description,
  )

  if (!data) {
    return (
      <>
        <PageHeader title={title} description={vehicle} />
        <Card className="flex items-center gap-3">
          <Radio aria-hidden className="size-6" />
          <p>This drive is still being recorded. Its verdict, chart and record appear once it is finished.</p>
        </Card>
        <Card>
          <LiveDrive driveId={driveId} />
        </Card>
      </>
    )
  }

  const [photos, revisions] = await Promise.all([
    head.job_id ? listRecordPhotos(db, head.job_id, head.task_id, me.shopId) : [],
    listRevisions(db, head.id, me.shopId),
  ])
  const t0 = data.score.startedAtMs ?? data.marks[0]?.t ?? 0
  // At most 2,000 points for the chart and the track, however long the drive (lib/record/downsample.ts).
  const points = downsampleTimeline(data.timeline, 2000)
  const following: Stretch[] = []
  for (let i = 0; i < data.timeline.length; i++) {
    const p = data.timeline[i]!
    const next = data.timeline[i + 1]
    if (p.state !== "following" || !next) continue
    const last = following.at(-1)
    if (last && Math.abs(last.toMin - p.tS / 60) < 1e-9) last.toMin = next.tS / 60
    else following.push({ fromMin: p.tS / 60, toMin: next.tS / 60 })
  }
  const chartMarks: ChartMark[] = data.marks
    .filter((m) => m.kind !== "gap" && m.kind !== "note")
    .map((m) => ({
      min: Math.round(((m.t - t0) / 60_000) * 100) / 100,
      label: MARK_LABEL[m.kind] ?? m.kind,
      kind: m.kind,
    }))
  const profile = data.score.profile

  return (
    <>
      <PageHeader
        title={title}
        description={
          <>
            {vehicle}
            {head.vin ? (
              <>
                {" "}
                · VIN <span className="font-mono">{head.vin}</span>
              </>
            ) : null}
          </>
        }
      />
      {/* Phones: one column with the verdict, then the review, then the rest (the columns dissolve and
          `order` lifts the review up); wide screens: two columns. */}
      <div className="flex flex-col gap-4 lg:grid lg:grid-cols-[3fr_2fr]">
        <div className="contents min-w-0 lg:block lg:space-y-4">
          <RecordSummary score={data.score} className="order-first" units={data.units} />
          <p
            className="order-first flex items-start gap-2 text-sm text-graphite-700 dark:text-graphite-200"
            data-testid="score-caution"
          >
            <ShieldAlert aria-hidden className="mt-0.5 size-4 shrink-0 text-signal-700 dark:text-signal-300" />
            The score describes how the drive went. Whether the calibration is done is what the vehicle itself reports,
            following the maker&apos;s procedure; the score never replaces that.
          </p>
          <CalibrationsSection calibrations={data.calibrations} units={data.units} />
          <Card>
            <h2 className="mb-2 text-lg font-semibold">Speed over time</h2>
            <SpeedChart
              points={points.map((p) => ({
                min: Math.round((p.tS / 60) * 1000) / 1000,
                mph: p.speedMph == null ? null : Math.round(p.speedMph * 10) / 10,
              }))}
              minSpeedMph={profile?.minSpeedMph ?? 35}
              maxSpeedMph={profile?.maxSpeedMph ?? null}
              following={following}
              marks={chartMarks}
            />
          </Card>
          <Card>
            <h2 className="mb-2 text-lg font-semibold">Track</h2>
            <TrackSvg timeline={points} />
          </Card>
          <Card>
            <h2 className="mb-2 text-lg font-semibold">Marks</h2>
            <MarkTimeline marks={data.marks} startMs={t0} units={data.units} />
          </Card>
        </div>
        <div className="contents min-w-0 lg:block lg:space-y-4">
          {head.job_id ? (
            <Card className="order-first flex flex-wrap items-center gap-2" data-testid="drive-job">
              {data.review?.decision === "redo" && head.task_id && me.role !== "co_driver" ? (
                <Link
                  className={buttonVariants({ variant: "primary" })}
                  href={`/record?jobId=${head.job_id}&taskId=${head.task_id}`}
                  data-testid="drive-again"
                >
                  <RotateCcw aria-hidden className="size-5" /> Drive again
                </Link>
              ) : null}
              {me.role !== "co_driver" ? (
                <Link
                  className={buttonVariants({ variant: "outline" })}
                  href={`/jobs/${head.job_id}`}
                  data-testid="drive-job-link"
                >
                  <Wrench aria-hidden className="size-5" /> Open the job
                  {head.ro_number ? ` (${roLabel(head.ro_number)})` : ""}
                </Link>
              ) : null}
            </Card>
          ) : null}
          {isLead ? (
            <Card className="order-first" data-testid="review-card">
              <h2 className="mb-2 text-lg font-semibold">Review</h2>
              {data.review ? (
                <p data-testid="review-decision">
                  {DECISION_WORD[data.review.decision]} by {data.review.reviewerName ?? "a shop lead"}
                  {data.review.note ? `: ${data.review.note}` : ""}
                </p>
              ) : head.status === "finished" ? (
                <ReviewActions driveId={head.public_id} />
              ) : null}
            </Card>
          ) : data.review ? (
            <Card className="order-first">
              <h2 className="mb-1 text-lg font-semibold">Review</h2>
              <p data-testid="review-decision">
                {DECISION_WORD[data.review.decision]} by {data.review.reviewerName ?? "a shop lead"}
                {data.review.note ? `: ${data.review.note}` : ""}
              </p>
            </Card>
          ) : null}
          <Card className="order-first">
            <h2 className="mb-2 text-lg font-semibold">Drive record</h2>
            <RecordActions driveId={head.public_id} canShare={isLead} customerEmail={head.customer_email} />
          </Card>
          <Card>
            <h2 className="mb-2 text-lg font-semibold">Revisions of the record</h2>
            <RevisionHistory
              revisions={revisions.map((r) => ({
                revision: r.revision,
                causeText: CAUSE_TEXT[r.cause],
                verdict: r.verdict,
                createdAt: new Date(r.created_at).toISOString(),
                byName: r.by_name,
                code: r.code,
              }))}
              finished={head.status === "finished"}
            />
          </Card>
          <Card className="space-y-1">
            <h2 className="mb-1 text-lg font-semibold">Who drove and who logged</h2>
            <p>Driver: {data.driverName ?? "Not recorded"}</p>
            <p>Co-driver: {data.coDriverName ?? "None"}</p>
            <p>Marks logged by: {data.markLoggers.join(", ") || "Nobody"}</p>
          </Card>
          {data.task ? (
            <Card className="space-y-1">
              <h2 className="mb-1 text-lg font-semibold">Calibration</h2>
              <p>{SENSOR_LABEL[data.task.sensor] ?? data.task.sensor}</p>
              <p>{METHOD_LABEL[data.task.method] ?? data.task.method}</p>
              <p>Reason: {REASON_LABEL[data.task.reason] ?? data.task.reason}</p>
              {data.profileName ? <p>Condition profile: {data.profileName}</p> : null}
            </Card>
          ) : null}
          <Card>
            <h2 className="mb-2 text-lg font-semibold">Checks before the drive</h2>
            {data.checklist ? (
              <ul className="divide-y divide-graphite-100 dark:divide-asphalt-700">
                {data.checklist.rows.map((r) => (
                  <li key={r.label} className="flex justify-between gap-3 py-1.5 text-sm">
                    <span>{r.label}</span>
                    <span className={r.ok === false ? "font-semibold text-stop-600 dark:text-stop-400" : ""}>
                      {r.value}
                      {r.ok === false ? " (check)" : ""}
                    </span>
                  </li>
                ))}
              </ul>
            ) : (
              <p className="text-graphite-600 dark:text-graphite-300">No checklist recorded.</p>
            )}
            {photos.length ? (
              <div className="mt-3 grid grid-cols-3 gap-2">
                {photos.map((p) => (
                  <a key={p.id} href={`/api/attachments/${p.id}`} target="_blank" rel="noopener" className="block">
                    {/* eslint-disable-next-line @next/next/no-img-element -- presigned object URLs, not optimisable */}
                    <img
                      src={`/api/attachments/${p.id}?variant=thumbnail`}
                      alt={p.filename}
                      loading="lazy"
                      className="aspect-square w-full rounded-lg object-cover"
                    />
                  </a>
                ))}
              </div>
            ) : null}
          </Card>
          <Card>
            <h2 className="mb-2 text-lg font-semibold">Download the drive</h2>
            <div className="flex flex-wrap gap-2">
              {(["drive", "gpx", "csv"] as const).map((f) => (
                <a
                  key={f}
                  className={buttonVariants({ variant: "outline", size: "sm" })}
                  href={`/api/drives/${head.public_id}/file?format=${f}`}
                >
                  <Download aria-hidden className="size-4" /> {f === "drive" ? "Drive file" : f.toUpperCase()}
                </a>
              ))}
            </div>
          </Card>
        </div>
      </div>
    </>
  )
}
