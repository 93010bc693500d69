import { Download } from "lucide-react"
import type { Metadata } from "next"
import Link from "next/link"
import { requirePageRole } from "@/app/_server/auth"
import { getFormatPrefs } from "@/app/_server/format-prefs"
import { loadNumbers } from "@/app/_server/numbers"
import { TimeToClearChart, TopReasonsChart, VerdictMixChart } from "@/components/numbers/numbers-charts"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { cn } from "@/components/ui/cn"
import { PageHeader } from "@/components/ui/page-header"
import { getReadDb } from "@/db/client"
import { formatDuration } from "@/lib/format"

export const metadata: Metadata = { title: "Numbers" }
export const dynamic = "force-dynamic"

const RANGES = [30, 90, 365] as const

export default async function NumbersPage({ searchParams }: { searchParams: Promise<{ days?: string }> }) {
  const me = await requirePageRole("shop_lead")
  const asked = Number((await searchParams).days)
  const days = (RANGES as readonly number[]).includes(asked) ? asked : 90
  const { timeZone } = await getFormatPrefs(me.shopId)
  const numbers = await loadNumbers(getReadDb(), me.shopId, days, timeZone)
  return (
    <>
      <PageHeader
        title="Numbers"
        description={`${numbers.drives} finished ${numbers.drives === 1 ? "drive" : "drives"} in the last ${days} days.`}
        actions={
          <a
            className={buttonVariants({ variant: "outline", size: "sm" })}
            href={`/api/numbers?format=csv&days=${days}`}
            data-testid="numbers-csv"
          >
            <Download aria-hidden className="size-4" /> CSV
          </a>
        }
      />
      <nav className="mb-4 flex gap-2" aria-label="Period">
        {RANGES.map((r) => (
          <Link
            key={r}
            href={`/numbers?days=${r}`}
            aria-current={r === days ? "page" : undefined}
            className={cn(buttonVariants({ variant: r === days ? "primary" : "ghost", size: "sm" }))}
          >
            {r} days
          </Link>
        ))}
      </nav>
      {numbers.timeZoneNote ? (
        <p className="mb-4 text-sm text-graphite-700 dark:text-graphite-200" data-testid="numbers-zone-note">
          {numbers.timeZoneNote}
        </p>
      ) : null}
      {numbers.drives === 0 ? (
        <Card data-testid="numbers-empty">
          No finished drives in this period yet. Try a longer period, or finish a drive to see it counted.
        </Card>
      ) : (
        <div className="grid gap-4 xl:grid-cols-2">
          <TimeToClearChart data={numbers.timeToClear} />
          <VerdictMixChart data={numbers.verdictMix} />
          <TopReasonsChart data={numbers.topReasons} />
          <Card className="p-0">
            {/* Phones: one block a technician (six columns do not fit); wider screens: the table. */}
            <div className="sm:hidden">
              <h2 className="px-3 pt-3 text-lg font-semibold">Per technician</h2>
              <ul className="divide-y divide-graphite-100 dark:divide-asphalt-700">
                {numbers.perTechnician.map((t) => (
                  <li key={t.technicianId} className="space-y-1 px-3 py-3">
                    <p className="font-semibold">{t.name}</p>
                    <dl className="grid grid-cols-2 gap-x-3 gap-y-0.5 tabular text-sm">
                      <dt className="text-graphite-600 dark:text-graphite-300">Drives</dt>
                      <dd>{t.drives}</dd>
                      <dt className="text-graphite-600 dark:text-graphite-300">Met</dt>
                      <dd>
                        {t.met} ({Math.round(t.metShare * 100)} %)
                      </dd>
                      <dt className="text-graphite-600 dark:text-graphite-300">Median to learn complete</dt>
                      <dd>{formatDuration(t.medianSecondsToClear)}</dd>
                      <dt className="text-graphite-600 dark:text-graphite-300">Harsh events</dt>
                      <dd>{t.harshEvents}</dd>
                      <dt className="text-graphite-600 dark:text-graphite-300">Sent back</dt>
                      <dd>{t.sentBack}</dd>
                    </dl>
                  </li>
                ))}
              </ul>
            </div>
            <div className="hidden overflow-x-auto sm:block">
              <table className="w-full text-left text-sm" data-testid="per-technician">
                <caption className="px-3 pt-3 text-left text-lg font-semibold">Per technician</caption>
                <thead>
                  <tr className="border-b border-graphite-200 text-graphite-600 dark:border-asphalt-700 dark:text-graphite-300">
                    <th scope="col" className="px-3 py-2 font-medium">
                      Technician
                    </th>
                    <th scope="col" className="px-3 py-2 font-medium">
                      Drives
                    </th>
                    <th scope="col" className="px-3 py-2 font-medium">
                      Met
                    </th>
                    <th scope="col" className="px-3 py-2 font-medium">
                      Median to learn complete
                    </th>
                    <th scope="col" className="px-3 py-2 font-medium">
                      Harsh events
                    </th>
                    <th scope="col" className="px-3 py-2 font-medium">
                      Sent back
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {numbers.perTechnician.map((t) => (
                    <tr
                      key={t.technicianId}
                      className="border-b border-graphite-100 last:border-0 dark:border-asphalt-700"
                    >
                      <td className="px-3 py-2">{t.name}</td>
                      <td className="px-3 py-2 tabular">{t.drives}</td>
                      <td className="px-3 py-2 tabular">
                        {t.met} ({Math.round(t.metShare * 100)} %)
                      </td>
                      <td className="px-3 py-2 tabular">{formatDuration(t.medianSecondsToClear)}</td>
                      <td className="px-3 py-2 tabular">{t.harshEvents}</td>
                      <td className="px-3 py-2 tabular">{t.sentBack}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </Card>
        </div>
      )}
    </>
  )
}
