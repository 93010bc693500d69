import type { Metadata } from "next"
import { requirePageRole } from "@/app/_server/auth"
import { JobForm } from "@/components/jobs/job-form"
import { PageHeader } from "@/components/ui/page-header"

export const metadata: Metadata = { title: "New job" }

export default async function NewJobPage() {
  await requirePageRole("technician", "shop_lead")
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title="New job" description="The repair order, the vehicle, and each sensor to calibrate." />
      <JobForm />
    </div>
  )
}
