import { CircleDot, Radio } from "lucide-react"
import Link from "next/link"
import { requirePageRole } from "@/app/_server/auth"
import { getFormatPrefs } from "@/app/_server/format-prefs"
import { formatDateTime } from "@/lib/format"
import { VerdictBadge } from "@/components/drives/verdict-badge"
import { buttonVariants } from "@/components/ui/button"
import { cn } from "@/components/ui/cn"
import { PageHeader } from "@/components/ui/page-header"
import { getReadDb } from "@/db/client"
import { listDrives } from "@/db/queries/drives"
import { roLabel, SENSOR_LABEL } from "@/lib/record"
import { listDrivesQuery, parseDriveCursor } from "@/lib/validation/drive"

export const metadata = { title: "Drives" }

const FILTERS = [
  { label: "All", query: "" },
  { label: "Recording", query: "status=recording" },
  { label: "Met", query: "verdict=met" },
  { label: "Short", query: "verdict=short" },
  { label: "Not met", query: "verdict=not_met" },
  { label: "Unverified", query: "verdict=unverified" },
]

function when(d: Date | string, timeZone: string) {
  return formatDateTime(d, timeZone)
}

/** " · 2019 Corvane Tallis" after a drive's title: the job's vehicle, else the words typed for an unplanned drive. */
function vehicleSuffix(d: {
  vehicle_year: number | null
  vehicle_make: string | null
  vehicle_model: string | null
  vehicle_description: string | null
}) {
  if (d.vehicle_make || d.vehicle_model)
    return ` · ${[d.vehicle_year, d.vehicle_make, d.vehicle_model].filter(Boolean).join(" ")}`
  return d.vehicle_description ? ` · ${d.vehicle_description}` : ""
}

export default async function DrivesPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>
}) {
  const user = await requirePageRole()
  const parsed = listDrivesQuery.safeParse(await searchParams)
  const query = parsed.success ? parsed.data : {}
  const cursor = parseDriveCursor(query.cursor) ?? undefined
  const { rows, nextCursor } = await listDrives(getReadDb(), user.shopId, {
    verdict: query.verdict,
    status: query.status,
    coDriverId: user.role === "co_driver" ? user.id : undefined,
    cursor,
  })
  const prefs = await getFormatPrefs(user.shopId)
  // The co-driver's way in: a large card for each drive being recorded that names them.
  const joinable =
    user.role === "co_driver"
      ? (await listDrives(getReadDb(), user.shopId, { status: "recording", coDriverId: user.id })).rows
      : []
  const current = query.verdict ? `verdict=${query.verdict}` : query.status ? `status=${query.status}` : ""
  const canRecord = user.role !== "co_driver"
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader
        title="Drives"
        description={
          user.role === "co_driver"
            ? "Drives that name you as co-driver."
            : "Every calibration drive of the shop, newest first."
        }
        actions={
          canRecord ? (
            <Link href="/record" className={buttonVariants({ variant: "signal" })}>
              <CircleDot aria-hidden className="size-5" /> Record a drive
            </Link>
          ) : null
        }
      />
      {joinable.length ? (
        <section aria-label="Drives you can join" className="mb-4 space-y-3" data-testid="join-cards">
          {joinable.map((d) => (
            <Link
              key={d.id}
              href={`/record/${d.public_id}/co-driver`}
              className="block rounded-2xl border-2 border-signal-500 bg-signal-300/20 p-4 hover:bg-signal-300/30 dark:border-signal-400 dark:bg-signal-700/20"
              data-testid="join-card"
              data-drive-id={d.public_id}
            >
              <span className="flex min-h-16 items-center gap-3 text-xl font-bold">
                <Radio aria-hidden className="size-7 shrink-0" /> Join as co-driver
              </span>
              <span className="block font-semibold">
                {d.ro_number ? roLabel(d.ro_number) : "Unplanned drive"}
                {vehicleSuffix(d)}
              </span>
              <span className="block text-sm">
                Driver {d.driver_name ?? "not named"} · started {when(d.created_at, prefs.timeZone)}
              </span>
            </Link>
          ))}
        </section>
      ) : null}
      <nav aria-label="Filter drives" className="mb-3 flex flex-wrap gap-2">
        {FILTERS.map((f) => (
          <Link
            key={f.label}
            href={f.query ? `/drives?${f.query}` : "/drives"}
            aria-current={current === f.query ? "page" : undefined}
            className={cn(
              "flex min-h-12 shrink-0 items-center rounded-full border-2 px-4 text-sm font-semibold",
              current === f.query
                ? "border-graphite-900 bg-graphite-900 text-white dark:border-signal-400 dark:bg-signal-400 dark:text-graphite-950"
                : "border-graphite-300 dark:border-graphite-600",
            )}
          >
            {f.label}
          </Link>
        ))}
      </nav>
      {rows.length === 0 ? (
        <p
          className="rounded-xl border border-dashed border-graphite-300 p-6 text-center text-graphite-600 dark:border-graphite-600 dark:text-graphite-300"
          data-testid="drives-empty"
        >
          {current
            ? "No drives with this filter. Choose All to see every drive."
            : canRecord
              ? "No drives yet. Record a drive to see it here."
              : "No drives name you as co-driver yet."}
        </p>
      ) : (
        <ul
          className="divide-y divide-graphite-200 overflow-hidden rounded-xl border border-graphite-200 bg-white dark:divide-asphalt-700 dark:border-asphalt-700 dark:bg-asphalt-800"
          data-testid="drive-list"
        >
          {rows.map((d) => {
            const href =
              d.status === "recording" && user.role === "co_driver"
                ? `/record/${d.public_id}/co-driver`
                : `/drives/${d.public_id}`
            return (
              <li key={d.id}>
                <Link
                  href={href}
                  className="flex min-h-16 items-center gap-3 px-4 py-3 hover:bg-graphite-50 dark:hover:bg-asphalt-700"
                  data-drive-id={d.public_id}
                >
                  <div className="min-w-0 flex-1">
                    <p className="line-clamp-2 font-semibold break-words">
                      {d.ro_number ? roLabel(d.ro_number) : "Unplanned drive"}
                      {d.task_sensor ? ` · ${SENSOR_LABEL[d.task_sensor] ?? d.task_sensor}` : ""}
                      {vehicleSuffix(d)}
                    </p>
                    <p className="text-sm break-words text-graphite-600 dark:text-graphite-300">
                      {when(d.created_at, prefs.timeZone)} · {d.driver_name ?? "Unknown driver"}
                      {d.co_driver_name ? ` with ${d.co_driver_name}` : ""}
                      {d.source === "import" ? " · imported" : ""}
                    </p>
                  </div>
                  <VerdictBadge verdict={d.status === "recording" ? null : d.verdict} />
                </Link>
              </li>
            )
          })}
        </ul>
      )}
      {nextCursor ? (
        <div className="mt-4 text-center">
          <Link
            className={buttonVariants({ variant: "outline" })}
            href={`/drives?${new URLSearchParams({ ...(query.verdict ? { verdict: query.verdict } : {}), ...(query.status ? { status: query.status } : {}), cursor: nextCursor })}`}
          >
            Older drives
          </Link>
        </div>
      ) : null}
    </div>
  )
}
