import { requirePageRole } from "@/app/_server/auth"
import { RecorderApp } from "@/components/recorder/recorder-app"

export default async function RecordPage() {
  await requirePageRole("technician", "shop_lead")
  return <RecorderApp />
}
