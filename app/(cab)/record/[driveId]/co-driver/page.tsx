import { requirePageRole } from "@/app/_server/auth"
import { RecorderApp } from "@/components/recorder/recorder-app"

/** A second phone, signed in as the drive's co-driver: marks only. */
export default async function CoDriverPage() {
  await requirePageRole("co_driver", "technician", "shop_lead")
  return <RecorderApp coDriver />
}
