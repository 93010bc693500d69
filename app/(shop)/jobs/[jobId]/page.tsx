import type { Metadata } from "next"
import { notFound } from "next/navigation"
import { requirePageRole } from "@/app/_server/auth"
import { JobDetail, type JobView } from "@/components/jobs/job-detail"
import { PageHeader } from "@/components/ui/page-header"
import { getDb } from "@/db/client"
import { loadJobDetail } from "@/db/queries/jobs"
import { roLabel } from "@/lib/record"
import { isUuid } from "@/lib/validation/uuid"

export const metadata: Metadata = { title: "Job" }

export default async function JobPage({ params }: { params: Promise<{ jobId: string }> }) {
  const user = await requirePageRole("technician", "shop_lead")
  const { jobId } = await params
  if (!isUuid(jobId)) notFound()
  const job = await loadJobDetail(getDb(), jobId, user.shopId)
  if (!job) notFound()
  // Dates go to the client as the API gives them (ISO strings).
  const initialJob = JSON.parse(JSON.stringify(job)) as JobView
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title={roLabel(job.roNumber)} description={job.customer.name} />
      <JobDetail initialJob={initialJob} canEdit isLead={user.role === "shop_lead" || user.role === "admin"} />
    </div>
  )
}
