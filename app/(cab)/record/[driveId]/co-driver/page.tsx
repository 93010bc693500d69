import { MapPin } from "lucide-react"
import { requirePageRole } from "@/app/_server/auth"
import { RecorderApp } from "@/components/recorder/recorder-app"

/** A second phone, signed in as the drive's co-driver: marks only. */
export default async function CoDriverPage() {
  await requirePageRole("co_driver", "technician", "shop_lead")
  return (
    <>
      <div className="mb-3 space-y-2">
        {/* Said before the browser asks, so the question does not come out of nowhere. */}
        <p className="flex items-start gap-2 text-sm text-graphite-300" data-testid="location-why">
          <MapPin aria-hidden className="mt-0.5 size-4 shrink-0" />
          This phone asks for its location only to know your speed, so the time-gap counter can turn seconds into a
          distance. The positions stay on this phone; the driver&apos;s phone records the drive.
        </p>
      </div>
      <RecorderApp coDriver />
    </>
  )
}
