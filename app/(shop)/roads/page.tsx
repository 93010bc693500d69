import { AlertTriangle, Clock, MapPin, ShieldAlert } from "lucide-react"
import type { Metadata } from "next"
import { requirePageRole } from "@/app/_server/auth"
import { loadRoadsView, type RoadsView } from "@/app/_server/roads"
import { RoadKnowledgeSwitch } from "@/components/roads/road-knowledge-switch"
import { LOOP_STROKE, RoadMap } from "@/components/roads/road-map"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { PageHeader } from "@/components/ui/page-header"
import { getReadDb } from "@/db/client"
import { listProfiles } from "@/db/queries/profiles"
import { ROAD_RESOLUTION } from "@/lib/roads/cells"
import { WEEKDAYS } from "@/lib/roads/clock"
import { HOUR_WINDOW, NEAR_SHOP_M } from "@/lib/roads/model"
import { roadsQuery, WEEKDAY_KEYS } from "@/lib/validation/roads"
import { formatDistance, formatDuration, formatHour, formatLength } from "@/lib/format"

export const metadata: Metadata = { title: "Roads" }
export const dynamic = "force-dynamic"

/** A resolution-9 H3 cell is about 350 m across (twice its mean edge of about 174 m, from H3's table of cell areas and edge lengths). */
const H3_RES9_ACROSS_M = 350

const hh = formatHour

function slotWords(view: RoadsView) {
  const hour =
    view.hour == null
      ? "any hour"
      : `${hh((view.hour - HOUR_WINDOW + 24) % 24)} to ${hh((view.hour + HOUR_WINDOW + 1) % 24)}`
  const day =
    view.weekday != null
      ? `${WEEKDAYS[view.weekday]}s`
      : view.dayKind == null
        ? "any day"
        : view.dayKind === "weekday"
          ? "weekdays"
          : "weekends"
  return `${day}, ${hour}`
}

function distance(view: RoadsView, m: number) {
  return formatDistance(m, view.units)
}

export default async function RoadsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>
}) {
  const me = await requirePageRole("technician", "shop_lead")
  const raw = Object.fromEntries(
    Object.entries(await searchParams).filter(([, v]) => typeof v === "string" && v !== ""),
  )
  const parsed = roadsQuery.safeParse(raw)
  const q = parsed.success ? parsed.data : roadsQuery.parse({})
  const db = getReadDb()
  const [view, profiles] = await Promise.all([
    loadRoadsView(db, me.shopId, q),
    listProfiles(db, me.shopId, { includeArchived: false }),
  ])
  const isAdmin = me.role === "admin"

  if (!view.enabled) {
    return (
      <>
        <PageHeader title="Roads" description="Where learns complete fastest, from this shop's own drives." />
        <Card className="space-y-3" data-testid="roads-off">
          <p>Road knowledge is turned off for this shop. No road model is kept, and none is shown.</p>
          {isAdmin ? (
            <RoadKnowledgeSwitch enabled={false} />
          ) : (
            <p className="text-sm text-graphite-600 dark:text-graphite-300">An admin can turn it on.</p>
          )}
        </Card>
      </>
    )
  }

  return (
    <>
      <PageHeader
        title="Roads"
        description={`Where learns complete fastest, from this shop's own drives. Now at the shop: ${WEEKDAYS[view.now.weekday]} ${hh(view.now.hour)} (${view.timeZone}).`}
      />
      <form
        method="get"
        className="mb-4 flex flex-wrap items-end gap-2"
        aria-label="Time of day"
        data-testid="roads-filter"
      >
        <label className="flex flex-col text-sm">
          Hour
          <select
            name="hour"
            defaultValue={String(q.hour)}
            className="min-h-12 rounded-lg border border-graphite-300 bg-white px-2 dark:border-asphalt-700 dark:bg-asphalt-800"
          >
            <option value="now">Now ({hh(view.now.hour)})</option>
            <option value="all">All day</option>
            {Array.from({ length: 24 }, (_, h) => (
              <option key={h} value={h}>
                {hh(h)}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col text-sm">
          Day
          <select
            name="day"
            defaultValue={q.day}
            className="min-h-12 rounded-lg border border-graphite-300 bg-white px-2 dark:border-asphalt-700 dark:bg-asphalt-800"
          >
            <option value="now">Today ({WEEKDAYS[view.now.weekday]})</option>
            {WEEKDAY_KEYS.map((key, i) => (
              <option key={key} value={key}>
                {WEEKDAYS[i]}s
              </option>
            ))}
            <option value="weekday">Weekdays</option>
            <option value="weekend">Weekends</option>
            <option value="all">Any day</option>
          </select>
        </label>
        {profiles.length ? (
          <label className="flex flex-col text-sm">
            Profile
            <select
              name="profileId"
              defaultValue={q.profileId ?? ""}
              className="min-h-12 max-w-56 rounded-lg border border-graphite-300 bg-white px-2 dark:border-asphalt-700 dark:bg-asphalt-800"
            >
              <option value="">All profiles</option>
              {profiles.map((p) => (
                <option key={p.profileId} value={p.profileId}>
                  {p.name}
                </option>
              ))}
            </select>
          </label>
        ) : null}
        <button type="submit" className={buttonVariants({ size: "sm" })}>
          Show
        </button>
      </form>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <Card className="space-y-2">
          <h2 className="text-lg font-semibold">
            Road cells,{" "}
            {view.hour != null
              ? `${hh(view.hour)} to ${hh((view.hour + 1) % 24)}, any day`
              : view.cellsBy === "weekday" && view.fellBackFromWeekday == null && view.weekday != null
                ? `${WEEKDAYS[view.weekday]}s, all hours`
                : view.cellsBy === "weekday" && view.fellBackFromWeekday != null
                  ? `${WEEKDAYS[view.fellBackFromWeekday]}s, all hours`
                  : "all hours"}
          </h2>
          {view.location ? (
            view.cells.length ? (
              <RoadMap view={view} />
            ) : (
              <p data-testid="roads-empty">No driving recorded in this hour yet. Try “All day”.</p>
            )
          ) : (
            <p data-testid="roads-empty">
              No scored drives yet, and no shop location in the settings: nothing to draw.
            </p>
          )}
        </Card>

        <div className="space-y-4">
          <Card className="space-y-3" data-testid="best-loops">
            <h2 className="text-lg font-semibold">Best loops for {slotWords(view)}</h2>
            {view.fellBackFromWeekday != null ? (
              <p className="text-sm text-graphite-600 dark:text-graphite-300" data-testid="loops-fell-back">
                Too few learns on {WEEKDAYS[view.fellBackFromWeekday]}s at this hour to rank by weekday (no loop with{" "}
                {view.trustedDrives} drives), so these rest on{" "}
                {view.dayKind == null
                  ? "every day of the week: hour of day only"
                  : view.dayKind === "weekday"
                    ? "all weekdays"
                    : "both weekend days"}
                .
              </p>
            ) : view.weekday != null ? (
              <p className="text-sm text-graphite-600 dark:text-graphite-300" data-testid="loops-by-weekday">
                Ranked from {WEEKDAYS[view.weekday]} drives only, at this hour.
              </p>
            ) : null}
            {view.loops.length ? (
              <ol className="space-y-3">
                {view.loops.map((l, i) => (
                  <li
                    key={l.loopId}
                    className="space-y-1 rounded-lg border border-graphite-200 p-3 dark:border-asphalt-700"
                    data-testid="best-loop"
                  >
                    <p className="flex items-center gap-2 font-semibold">
                      <span
                        className="inline-flex size-7 shrink-0 items-center justify-center rounded-full text-sm text-white"
                        style={{ backgroundColor: LOOP_STROKE[i] }}
                      >
                        {l.rank}
                      </span>
                      {/* One run of words, so a long name and its direction wrap together rather than in two columns. */}
                      <span className="min-w-0">
                        {l.name}
                        {l.direction ? (
                          <span className="font-normal text-graphite-600 dark:text-graphite-300"> · {l.direction}</span>
                        ) : null}
                      </span>
                    </p>
                    <p className="flex items-center gap-1 tabular">
                      <Clock aria-hidden className="size-4" /> Learn complete in a median{" "}
                      {formatDuration(l.medianClearSeconds)} (fastest {formatDuration(l.fastestClearSeconds)})
                    </p>
                    <p className="tabular text-sm text-graphite-600 dark:text-graphite-300">
                      {Math.round(l.qualifyingShare * 100)} % of the driving at qualifying speed · {l.drives}{" "}
                      {l.drives === 1 ? "drive" : "drives"} · track {distance(view, l.lengthMeters)}
                    </p>
                    {!l.trusted ? (
                      <p className="flex items-center gap-1 text-sm font-semibold text-stop-600 dark:text-stop-400">
                        <AlertTriangle aria-hidden className="size-4" /> Only {l.drives}{" "}
                        {l.drives === 1 ? "drive" : "drives"}: too few to trust (we want {view.trustedDrives}).
                      </p>
                    ) : null}
                  </li>
                ))}
              </ol>
            ) : (
              <p data-testid="best-loops-empty">
                No past drive that started near the shop completed its learn at this time yet. Try another hour or “Any
                day”.
              </p>
            )}
          </Card>

          <Card className="space-y-2 text-sm" data-testid="roads-explained">
            <h2 className="text-lg font-semibold">How these figures are made</h2>
            <p>
              They rest on <strong>{view.drives}</strong> scored {view.drives === 1 ? "drive" : "drives"} of this shop,{" "}
              <strong>{view.completedDrives}</strong> of them with the learn complete.{" "}
              {view.completedDrives < view.trustedDrives ? <strong>That is too few to trust yet.</strong> : null}
            </p>
            <p>
              Every scored drive adds its samples to hexagonal cells of about{" "}
              {formatLength(H3_RES9_ACROSS_M, view.units)} across (H3 grid, resolution {ROAD_RESOLUTION}): the minutes
              driven, the share at qualifying speed and following, the median speed and the harsh events, by hour of day
              and weekday in the shop&apos;s time zone ({view.timeZone}). A cell&apos;s colour is its share of
              qualifying time; its other figures show when you point at it.
            </p>
            <p>
              A loop is a group of past drives that covered mostly the same roads. The best loops are those whose drives
              started within {distance(view, NEAR_SHOP_M)} of the shop, completed the learn, and started within{" "}
              {HOUR_WINDOW} hour of the hour chosen, on the same weekday when the history holds a loop of at least{" "}
              {view.trustedDrives} such drives, else on the same kind of day (weekday or weekend), else on any day; they
              are ranked by the median time to learn complete. A loop resting on fewer than {view.trustedDrives} drives
              is listed last and marked. The map by hour counts every day of the week.
            </p>
            <p className="flex items-start gap-1">
              <MapPin aria-hidden className="mt-0.5 size-4 shrink-0" />
              {view.location
                ? view.location.source === "settings"
                  ? "The shop's place comes from the shop settings."
                  : "The shop's place is taken from where its drives start (no location in the settings)."
                : "The shop has no location yet."}{" "}
              Only this shop&apos;s drives are used; the figures are never shared, and never appear on a drive record or
              its share link.
            </p>
            <p className="flex items-start gap-1 font-semibold">
              <ShieldAlert aria-hidden className="mt-0.5 size-4 shrink-0" />
              Past traffic is no promise: obey traffic law and drive for the road as it is. The vehicle maker&apos;s
              service information comes first.
            </p>
            {isAdmin ? <RoadKnowledgeSwitch enabled /> : null}
          </Card>
        </div>
      </div>
    </>
  )
}
