import { AlertTriangle, ChevronRight, ClipboardCheck } from "lucide-react"
import type { Metadata } from "next"
import Link from "next/link"
import { requirePageRole } from "@/app/_server/auth"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import { Bullets } from "@/components/ui/bullets"
import { Card } from "@/components/ui/card"
import { PageHeader } from "@/components/ui/page-header"
import { getReadDb } from "@/db/client"
import { listReviewQueue } from "@/db/queries/reviews"
import { getFormatPrefs } from "@/app/_server/format-prefs"
import { describeReasons } from "@/lib/format/conditions"
import { describeVehicle, roLabel } from "@/lib/record"

export const metadata: Metadata = { title: "Review" }
export const dynamic = "force-dynamic"

function waited(finishedAt: Date | string | null) {
  if (!finishedAt) return ""
  const minutes = Math.max(0, Math.round((Date.now() - new Date(finishedAt).getTime()) / 60_000))
  if (minutes < 60) return `finished ${minutes} min ago`
  if (minutes < 48 * 60) return `finished ${Math.round(minutes / 60)} h ago`
  return `finished ${Math.round(minutes / 1440)} days ago`
}

export default async function ReviewPage() {
  const me = await requirePageRole("shop_lead")
  const [{ rows }, { units }] = await Promise.all([listReviewQueue(getReadDb(), me.shopId), getFormatPrefs(me.shopId)])
  return (
    <>
      <PageHeader
        title="Review"
        description="Finished drives that need a second look: not met, or with harsh events. Oldest first."
      />
      {rows.length === 0 ? (
        <Card className="flex items-center gap-3" data-testid="review-empty">
          <ClipboardCheck aria-hidden className="size-6 text-teal-600" />
          <p>Nothing waiting. Every finished drive has been looked at.</p>
        </Card>
      ) : (
        <ul className="space-y-3" data-testid="review-queue">
          {rows.map((r) => {
            const score = r.result
            const words = describeReasons(score, units)
            const harsh = (score.harshEvents?.accel ?? 0) + (score.harshEvents?.decel ?? 0)
            return (
              <li key={r.id} data-drive-id={r.public_id}>
                <Link href={`/drives/${r.public_id}`} className="block rounded-xl focus-visible:outline-3">
                  <Card className="flex items-start gap-3 transition-colors hover:border-graphite-400">
                    <div className="min-w-0 flex-1 space-y-1.5">
                      <div className="flex flex-wrap items-center gap-2">
                        <VerdictBadge verdict={r.verdict} />
                        {harsh > 0 ? (
                          <span className="inline-flex items-center gap-1 rounded-full border border-signal-600 px-2 py-0.5 text-sm font-medium text-signal-700 dark:text-signal-300">
                            <AlertTriangle aria-hidden className="size-4" /> {harsh} harsh{" "}
                            {harsh === 1 ? "event" : "events"}
                          </span>
                        ) : null}
                      </div>
                      <p className="font-semibold break-words">
                        {r.ro_number ? roLabel(r.ro_number) : "Unplanned drive"}
                        {" · "}
                        {describeVehicle(
                          r.vehicle_make || r.vehicle_model
                            ? { year: r.vehicle_year, make: r.vehicle_make, model: r.vehicle_model }
                            : null,
                          r.vehicle_description,
                        )}
                      </p>
                      <Bullets
                        className="list-disc pl-5 text-sm text-graphite-700 dark:text-graphite-200"
                        items={[...words.reasons, ...words.notes].slice(0, 3)}
                      />
                      <p className="text-sm text-graphite-600 dark:text-graphite-300">
                        {r.driver_name ?? "Unknown driver"} · {waited(r.finished_at)}
                      </p>
                    </div>
                    <ChevronRight aria-hidden className="mt-1 size-6 shrink-0 text-graphite-400" />
                  </Card>
                </Link>
              </li>
            )
          })}
        </ul>
      )}
    </>
  )
}
