import { Clock, FileDown, LinkIcon, ShieldAlert } from "lucide-react"
import type { Metadata } from "next"
import { loadSharedRecord } from "@/app/_server/record-data"
import { RecordSummary } from "@/components/record/record-summary"
import { TrackSvg } from "@/components/record/track-svg"
import { Logo } from "@/components/shell/logo"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { getDb } from "@/db/client"
import { DECISION_WORD, describeVehicle, roLabel, METHOD_LABEL, REASON_LABEL, RECORD_CAUTIONS, SENSOR_LABEL } from "@/lib/record"

export const dynamic = "force-dynamic"
export const metadata: Metadata = { title: "Drive record", robots: { index: false, follow: false }, referrer: "no-referrer" }

const PROBLEM = {
  withdrawn: { title: "This link was withdrawn", text: "The shop has withdrawn this link. Ask the shop for a new one." },
  expired: { title: "This link has expired", text: "Share links stop working after a while. Ask the shop for a new link." },
  malformed: { title: "This link is not valid", text: "The link is incomplete or was changed. Check that you copied all of it, or ask the shop for a new one." },
  bad_signature: { title: "This link is not valid", text: "The link is incomplete or was changed. Check that you copied all of it, or ask the shop for a new one." },
  gone: { title: "This record is no longer available", text: "The shop has removed this drive. Ask the shop if you need its record." },
  not_ready: { title: "This record is not ready yet", text: "The drive is still being recorded. Try the link again later." },
} as const

export default async function SharedRecordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params
  const shared = await loadSharedRecord(getDb(), token, { photos: false })
  return (
    <div className="mx-auto max-w-3xl px-4 py-6">
      <header className="mb-6 flex items-center gap-2 font-bold">
        <Logo className="size-8" />
        <span>Straightaway</span>
        <span className="font-normal text-graphite-600 dark:text-graphite-300">· drive record</span>
      </header>
      {shared.ok ? <SharedRecord token={token} shared={shared} /> : <LinkProblem reason={shared.reason} />}
    </div>
  )
}

function LinkProblem({ reason }: { reason: keyof typeof PROBLEM }) {
  const p = PROBLEM[reason]
  const Icon = reason === "expired" ? Clock : ShieldAlert
  return (
    <Card className="space-y-2" data-testid="share-problem" data-reason={reason}>
      <h1 className="flex items-center gap-2 text-2xl font-bold">
        <Icon aria-hidden className="size-7" /> {p.title}
      </h1>
      <p>{p.text}</p>
    </Card>
  )
}

function SharedRecord({ token, shared }: { token: string; shared: Extract<Awaited<ReturnType<typeof loadSharedRecord>>, { ok: true }> }) {
  const { data } = shared
  return (
    <div className="space-y-5" data-testid="shared-record">
      <div>
        <p className="text-graphite-600 dark:text-graphite-300">{data.shopName}</p>
        <h1 className="text-2xl font-bold tracking-tight">{describeVehicle(data.vehicle, data.vehicleDescription)}</h1>
        <p className="text-graphite-700 dark:text-graphite-200">
          {data.vehicle ? <>VIN <span className="tabular font-mono">{data.vehicle.vin}</span></> : null}
          {data.job ? <> · {roLabel(data.job.roNumber)}</> : null}
        </p>
        {data.task ? (
          <p className="text-graphite-700 dark:text-graphite-200">
            {SENSOR_LABEL[data.task.sensor] ?? data.task.sensor} · {METHOD_LABEL[data.task.method] ?? data.task.method} · {REASON_LABEL[data.task.reason] ?? data.task.reason}
          </p>
        ) : null}
      </div>
      <RecordSummary score={data.score} />
      <Card>
        <h2 className="mb-2 text-lg font-semibold">Track</h2>
        <TrackSvg timeline={data.timeline} />
      </Card>
      <Card className="space-y-1">
        <h2 className="text-lg font-semibold">Shop lead&apos;s review</h2>
        {data.review ? (
          <p>
            {DECISION_WORD[data.review.decision]} by {data.review.reviewerName ?? "a shop lead"}
            {data.review.note ? `: ${data.review.note}` : ""}
          </p>
        ) : (
          <p>Not reviewed.</p>
        )}
      </Card>
      <Card className="space-y-2 border-signal-500">
        <h2 className="text-lg font-semibold">Please read</h2>
        <ul className="list-disc space-y-1 pl-5">
          {RECORD_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </Card>
      <div className="flex flex-wrap items-center gap-3">
        <a className={buttonVariants({ variant: "primary" })} href={`/share/${token}/record`}>
          <FileDown aria-hidden className="size-5" /> Download the record (PDF)
        </a>
        <span className="inline-flex items-center gap-1 text-sm text-graphite-600 dark:text-graphite-300">
          <LinkIcon aria-hidden className="size-4" /> Link works until {new Date(shared.expiresAtMs).toISOString().slice(0, 10)}
        </span>
      </div>
    </div>
  )
}
