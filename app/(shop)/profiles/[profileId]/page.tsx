import type { Metadata } from "next"
import { notFound } from "next/navigation"
import { requirePageRole } from "@/app/_server/auth"
import { loadProfileDetail } from "@/app/_server/services/profiles"
import { ProfileEditor } from "@/components/profiles/profile-editor"
import { formatShown, PROFILE_FIELDS, toDisplay, unitLabel } from "@/components/profiles/profile-fields"
import { Card } from "@/components/ui/card"
import { LocalTime } from "@/components/ui/local-time"
import { PageHeader } from "@/components/ui/page-header"
import { getDb } from "@/db/client"
import { findShopSettings } from "@/db/queries/shop-settings"
import { hasRole } from "@/lib/auth/roles"
import { isUuid } from "@/lib/validation/uuid"

export const metadata: Metadata = { title: "Condition profile" }

export default async function ProfilePage({ params }: { params: Promise<{ profileId: string }> }) {
  const user = await requirePageRole("technician", "shop_lead")
  const { profileId } = await params
  if (!isUuid(profileId)) notFound()
  const db = getDb()
  const [detail, { units }] = await Promise.all([
    loadProfileDetail(db, profileId, user.shopId),
    findShopSettings(db, user.shopId),
  ])
  if (!detail) notFound()
  const { profile, versions } = detail
  return (
    <div className="mx-auto max-w-3xl space-y-6">
      <PageHeader
        title={profile.name}
        description={`Version ${profile.version} · shown in ${units === "metric" ? "km/h and metres" : "mph and feet"}, as the shop prefers`}
      />
      <ProfileEditor
        key={profile.versionId}
        profile={{ id: profile.id, name: profile.name, sensor: profile.sensor }}
        settings={profile.settings}
        roadTestChecks={profile.roadTestChecks}
        units={units}
        canEdit={hasRole(user.role, ["shop_lead"])}
      />
      <section className="space-y-2">
        <h2 className="text-lg font-bold">Versions</h2>
        <ul className="space-y-2">
          {versions.map((v, i) => {
            const older = versions[i + 1]
            const changed = older ? PROFILE_FIELDS.filter((f) => f.get(v.settings) !== f.get(older.settings)) : []
            return (
              <li key={v.id}>
                <Card className="space-y-1" data-testid={`profile-version-${v.version}`}>
                  <p className="font-semibold">
                    Version {v.version}
                    {v.version === profile.version ? " (current)" : ""}
                  </p>
                  <p className="text-sm text-graphite-600 dark:text-graphite-300">
                    <LocalTime iso={new Date(v.createdAt).toISOString()} />
                    {v.createdBy ? ` · ${v.createdBy}` : ""}
                  </p>
                  {changed.length ? (
                    <ul className="text-sm">
                      {changed.map((f) => {
                        const show = (n: number | null) =>
                          n === null
                            ? "none"
                            : `${formatShown(toDisplay(f.kind, n, units), f.kind)} ${unitLabel(f.kind, units)}`
                        return (
                          <li key={f.name}>
                            {f.label}: {show(f.get(older!.settings))} → {show(f.get(v.settings))}
                          </li>
                        )
                      })}
                    </ul>
                  ) : older ? null : (
                    <p className="text-sm">First version.</p>
                  )}
                </Card>
              </li>
            )
          })}
        </ul>
      </section>
    </div>
  )
}
