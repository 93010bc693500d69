import { Plus } from "lucide-react"
import type { Metadata } from "next"
import Link from "next/link"
import { requirePageRole } from "@/app/_server/auth"
import { formatShown, toDisplay, unitLabel } from "@/components/profiles/profile-fields"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { PageHeader } from "@/components/ui/page-header"
import { getDb } from "@/db/client"
import { formatMinutesSetting } from "@/lib/format"
import { listProfiles } from "@/db/queries/profiles"
import { findShopSettings } from "@/db/queries/shop-settings"
import { hasRole } from "@/lib/auth/roles"
import { SENSOR_LABEL, type Sensor } from "@/lib/validation/job"

export const metadata: Metadata = { title: "Condition profiles" }

export default async function ProfilesPage() {
  const user = await requirePageRole("technician", "shop_lead")
  const db = getDb()
  const [profiles, settings] = await Promise.all([listProfiles(db, user.shopId), findShopSettings(db, user.shopId)])
  const u = settings.units
  return (
    <>
      <PageHeader
        title="Condition profiles"
        description="What a drive is held to. Editing one makes a new version; recorded drives keep theirs."
        actions={
          hasRole(user.role, ["shop_lead"]) ? (
            <Link href="/profiles/new" className={buttonVariants({ variant: "signal" })}>
              <Plus aria-hidden className="size-5" /> New profile
            </Link>
          ) : null
        }
      />
      <ul className="grid gap-3 md:grid-cols-2">
        {profiles.map((p) => (
          <li key={p.profileId}>
            <Card className="space-y-1">
              <Link
                href={`/profiles/${p.profileId}`}
                className="flex min-h-12 items-center text-lg font-bold underline-offset-4 hover:underline"
              >
                {p.name}
              </Link>
              <p className="text-sm text-graphite-600 dark:text-graphite-300">
                {p.sensor ? SENSOR_LABEL[p.sensor as Sensor] : "Any sensor"} · version {p.version}
                {p.archived ? " · archived" : ""}
              </p>
              <p className="tabular text-sm">
                {formatShown(toDisplay("speed", p.settings.minSpeedMph, u), "speed")}
                {p.settings.maxSpeedMph != null
                  ? `–${formatShown(toDisplay("speed", p.settings.maxSpeedMph, u), "speed")}`
                  : "+"}{" "}
                {unitLabel("speed", u)} · {formatMinutesSetting(p.settings.minQualifyingMinutes)} qualifying ·{" "}
                {p.settings.minFollowingMinutes > 0
                  ? `${formatMinutesSetting(p.settings.minFollowingMinutes)} following at ${formatShown(toDisplay("distance", p.settings.leadGapFt.min, u), "distance")}–${formatShown(toDisplay("distance", p.settings.leadGapFt.max, u), "distance")} ${unitLabel("distance", u)}`
                  : "no lead vehicle needed"}
              </p>
            </Card>
          </li>
        ))}
      </ul>
      {profiles.length === 0 ? <p>No profiles yet: drives use the defaults of the drive file.</p> : null}
    </>
  )
}
