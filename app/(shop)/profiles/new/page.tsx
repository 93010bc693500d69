import type { Metadata } from "next"
import { requirePageRole } from "@/app/_server/auth"
import { ProfileEditor } from "@/components/profiles/profile-editor"
import { PageHeader } from "@/components/ui/page-header"
import { getDb } from "@/db/client"
import { findShopSettings } from "@/db/queries/shop-settings"
import { DEFAULT_PROFILE } from "@/lib/drive-file"

export const metadata: Metadata = { title: "New condition profile" }

export default async function NewProfilePage() {
  const user = await requirePageRole("shop_lead")
  const { units } = await findShopSettings(getDb(), user.shopId)
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title="New condition profile" description="Starts from the defaults; change what this learn needs." />
      <ProfileEditor
        settings={{ ...DEFAULT_PROFILE, leadGapFt: { ...DEFAULT_PROFILE.leadGapFt } }}
        units={units}
        canEdit
      />
    </div>
  )
}
