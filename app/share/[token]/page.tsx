import { Building2, Clock, FileDown, History, LinkIcon, ShieldAlert } from "lucide-react"
import type { Metadata } from "next"
import { loadSharedRecord } from "@/app/_server/record-data"
import { CalibrationsSection } from "@/components/record/calibrations-section"
import { shareRevisionState } from "@/app/_server/record-seal"
import { RecordSummary } from "@/components/record/record-summary"
import { TrackSvg } from "@/components/record/track-svg"
import { Logo } from "@/components/shell/logo"
import { Bullets } from "@/components/ui/bullets"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { LocalTime } from "@/components/ui/local-time"
import { getDb } from "@/db/client"
import { DECISION_WORD, describeVehicle, METHOD_LABEL, REASON_LABEL, RECORD_CAUTIONS, SENSOR_LABEL } from "@/lib/record"

export const dynamic = "force-dynamic"
export const metadata: Metadata = {
  title: "Drive record",
  robots: { index: false, follow: false },
  referrer: "no-referrer",
}

const PROBLEM = {
  withdrawn: {
    title: "This link was withdrawn",
    text: "The shop has withdrawn this link. Ask the shop for a new one.",
  },
  expired: {
    title: "This link has expired",
    text: "Share links stop working after a while. Ask the shop for a new link.",
  },
  malformed: {
    title: "This link is not valid",
    text: "The link is incomplete or was changed. Check that you copied all of it, or ask the shop for a new one.",
  },
  bad_signature: {
    title: "This link is not valid",
    text: "The link is incomplete or was changed. Check that you copied all of it, or ask the shop for a new one.",
  },
  gone: {
    title: "This record is no longer available",
    text: "The shop has removed this drive. Ask the shop if you need its record.",
  },
  not_ready: {
    title: "This record is not ready yet",
    text: "The drive is still being recorded. Try the link again later.",
  },
} as const

/** What each verdict means for a customer, in a sentence, before the shop's reasons. */
const VERDICT_MEANING = {
  met: "The drive met every condition it was held to.",
  short:
    "The vehicle reported the learn complete, but the driving before that was shorter than the conditions ask for.",
  not_met: "The vehicle did not report the learn complete during this drive.",
  unverified:
    "The learn was reported complete, but the record does not show the driver-assist function confirmed working afterwards.",
} as const

export default async function SharedRecordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params
  const shared = await loadSharedRecord(getDb(), token, { photos: false })
  return (
    <div className="mx-auto max-w-3xl px-4 py-6">
      {shared.ok ? (
        <>
          <RevisionNote state={await shareRevisionState(getDb(), token, shared.head.id, shared.head.shop_id)} />
          <SharedRecord token={token} shared={shared} />
        </>
      ) : (
        <LinkProblem reason={shared.reason} />
      )}
      <footer className="mt-8 flex items-center gap-2 border-t border-graphite-200 pt-4 text-sm text-graphite-600 dark:border-asphalt-700 dark:text-graphite-300">
        <Logo className="size-6" />
        <span>Drive record made with Straightaway. Read only; nobody can change it through this link.</span>
      </footer>
    </div>
  )
}

/** Which revision the page shows, and a plain warning when the record changed after the link was made. */
function RevisionNote({ state }: { state: Awaited<ReturnType<typeof shareRevisionState>> }) {
  if (!state) return null
  return state.revisedAfterLink ? (
    <div
      role="status"
      className="mb-4 flex items-start gap-2 rounded-xl border-2 border-signal-500 bg-signal-300/15 p-3 dark:border-signal-400 dark:bg-signal-700/20"
      data-testid="share-revised"
    >
      <History aria-hidden className="mt-0.5 size-5 shrink-0 text-signal-700 dark:text-signal-300" />
      <p>
        This record was revised on <LocalTime iso={state.revisedAt} />, after this link was made. The page shows the
        latest revision ({state.revision}); a PDF saved earlier may show an older result.
      </p>
    </div>
  ) : (
    <p
      className="mb-2 flex items-center gap-2 text-sm text-graphite-600 dark:text-graphite-300"
      data-testid="share-revision"
    >
      <History aria-hidden className="size-4 shrink-0" /> Revision {state.revision} of this record, the latest.
    </p>
  )
}

function LinkProblem({ reason }: { reason: keyof typeof PROBLEM }) {
  const p = PROBLEM[reason]
  const Icon = reason === "expired" ? Clock : ShieldAlert
  return (
    <Card className="space-y-2" data-testid="share-problem" data-reason={reason}>
      <h1 className="flex items-center gap-2 text-2xl font-bold">
        <Icon aria-hidden className="size-7 shrink-0" /> {p.title}
      </h1>
      <p>{p.text}</p>
      <p className="text-sm text-graphite-600 dark:text-graphite-300">
        No part of the record is shown through a link that does not check out.
      </p>
    </Card>
  )
}

function SharedRecord({
  token,
  shared,
}: {
  token: string
  shared: Extract<Awaited<ReturnType<typeof loadSharedRecord>>, { ok: true }>
}) {
  const { data } = shared
  const verdict = data.score.verdict
  return (
    <div className="space-y-5" data-testid="shared-record">
      <header className="space-y-3 border-b border-graphite-200 pb-4 dark:border-asphalt-700">
        <p className="flex items-center gap-2">
          <Building2 aria-hidden className="size-5 shrink-0 text-graphite-600 dark:text-graphite-300" />
          <span className="text-lg font-bold">{data.shopName}</span>
          <span className="text-graphite-600 dark:text-graphite-300">· drive record</span>
        </p>
        <div>
          <h1 className="text-2xl font-bold tracking-tight">
            {describeVehicle(data.vehicle, data.vehicleDescription)}
          </h1>
          {data.task ? (
            <p className="text-graphite-700 dark:text-graphite-200">
              {SENSOR_LABEL[data.task.sensor] ?? data.task.sensor} ·{" "}
              {METHOD_LABEL[data.task.method] ?? data.task.method} ·{" "}
              {REASON_LABEL[data.task.reason] ?? data.task.reason}
            </p>
          ) : null}
        </div>
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm sm:grid-cols-[auto_1fr_auto_1fr]">
          {data.vehicle ? (
            <>
              <dt className="text-graphite-600 dark:text-graphite-300">VIN</dt>
              <dd className="font-mono tabular break-all">{data.vehicle.vin}</dd>
            </>
          ) : null}
          {data.job ? (
            <>
              <dt className="text-graphite-600 dark:text-graphite-300">Repair order</dt>
              <dd>{data.job.roNumber}</dd>
            </>
          ) : null}
          <dt className="text-graphite-600 dark:text-graphite-300">Driven</dt>
          <dd>{data.startedAt ? <LocalTime iso={data.startedAt} timeZone={data.timeZone} /> : "Not recorded"}</dd>
          <dt className="text-graphite-600 dark:text-graphite-300">Driver</dt>
          <dd>
            {data.driverName ?? "Not recorded"}
            {data.coDriverName ? `, co-driver ${data.coDriverName}` : ""}
          </dd>
        </dl>
      </header>
      <section aria-labelledby="how-it-went" className="space-y-2">
        <h2 id="how-it-went" className="text-lg font-semibold">
          How the drive went
        </h2>
        <RecordSummary score={data.score} meaning={VERDICT_MEANING[verdict]} units={data.units} />
      </section>
      <CalibrationsSection calibrations={data.calibrations} units={data.units} />
      <section
        aria-labelledby="please-read"
        className="space-y-2 rounded-xl border-2 border-signal-500 bg-signal-300/15 p-4 dark:border-signal-400 dark:bg-signal-700/20"
        data-testid="share-cautions"
      >
        <h2 id="please-read" className="flex items-center gap-2 text-lg font-semibold">
          <ShieldAlert aria-hidden className="size-5 shrink-0 text-signal-700 dark:text-signal-300" /> Please read: the
          vehicle has the final word
        </h2>
        <Bullets className="list-disc space-y-1 pl-5" items={RECORD_CAUTIONS} />
      </section>
      <Card className="space-y-1">
        <h2 className="text-lg font-semibold">Shop review</h2>
        {data.review ? (
          <p>
            {DECISION_WORD[data.review.decision]} by {data.review.reviewerName ?? "a shop lead"}
            {data.review.note ? `: ${data.review.note}` : ""}
          </p>
        ) : (
          <p>Not reviewed by a shop lead.</p>
        )}
      </Card>
      <Card>
        <h2 className="mb-2 text-lg font-semibold">Track</h2>
        <TrackSvg timeline={data.timeline} />
      </Card>
      <div className="flex flex-wrap items-center gap-3">
        <a className={buttonVariants({ variant: "primary" })} href={`/share/${token}/record`}>
          <FileDown aria-hidden className="size-5" /> Download the record (PDF)
        </a>
        <span className="inline-flex items-center gap-1 text-sm text-graphite-600 dark:text-graphite-300">
          <LinkIcon aria-hidden className="size-4" /> This link works until{" "}
          <LocalTime iso={new Date(shared.expiresAtMs).toISOString()} style="date" timeZone={data.timeZone} />
        </span>
      </div>
    </div>
  )
}
