import type { Metadata } from "next"
import { requirePageRole } from "@/app/_server/auth"
import { ReviewMailForm, ShopFormatForm, ShopLocationForm } from "@/components/settings/settings-forms"
import { Card } from "@/components/ui/card"
import { PageHeader } from "@/components/ui/page-header"
import { getDb } from "@/db/client"
import { findReviewMail } from "@/db/queries/review-notices"
import { findShopSettings } from "@/db/queries/shop-settings"
import { DEFAULT_TIME_ZONE, formatDateTime } from "@/lib/format"

export const metadata: Metadata = { title: "Settings" }
export const dynamic = "force-dynamic"

/** The time of this request in the shop's zone: a server component renders once per request. */
function requestTimeIn(timeZone: string): string {
  return formatDateTime(Date.now(), timeZone, { zoneName: true })
}

export default async function SettingsPage() {
  const me = await requirePageRole("shop_lead")
  const db = getDb()
  const [settings, reviewMail] = await Promise.all([
    findShopSettings(db, me.shopId),
    findReviewMail(db, me.id, me.shopId),
  ])
  const zones = Intl.supportedValuesOf("timeZone")
  if (!zones.includes(settings.timeZone)) zones.unshift(settings.timeZone)
  return (
    <div className="mx-auto max-w-2xl space-y-4">
      <PageHeader title="Settings" />
      {me.role === "shop_lead" ? (
        <Card className="space-y-2">
          <h2 className="text-lg font-semibold">Your notices</h2>
          <p className="text-sm text-graphite-600 dark:text-graphite-300">
            Each drive that waits for review puts a notice under the bell. You can have it by e-mail as well.
          </p>
          <ReviewMailForm initial={reviewMail} />
        </Card>
      ) : null}
      <Card className="space-y-2">
        <h2 className="text-lg font-semibold">Units and time zone of the shop</h2>
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          Every page, drive record and e-mail writes numbers and times this way. Without a choice the shop reads US
          customary units in {DEFAULT_TIME_ZONE.replace("_", " ")} time.
        </p>
        <ShopFormatForm
          initial={{ units: settings.units, timeZone: settings.timeZone }}
          zones={zones}
          canEdit={me.role === "admin"}
          serverNow={requestTimeIn(settings.timeZone)}
        />
      </Card>
      <Card className="space-y-2">
        <h2 className="text-lg font-semibold">Where the shop is</h2>
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          The Roads page draws its map around this place, takes the best loops from drives that start near it, and reads
          hours and weekdays in the time zone above. Without a location it takes the middle of where the shop&apos;s
          drives start.
        </p>
        <ShopLocationForm initial={settings.location} canEdit={me.role === "admin"} />
      </Card>
    </div>
  )
}
