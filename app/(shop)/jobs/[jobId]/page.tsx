import type { Metadata } from "next"
import { loadJobPage } from "@/app/_server/job-page"
import { JobDetail, type JobView } from "@/components/jobs/job-detail"
import { PageHeader } from "@/components/ui/page-header"
import { roLabel } from "@/lib/record"

export const metadata: Metadata = { title: "Job" }

export default async function JobPage({ params }: { params: Promise<{ jobId: string }> }) {
  const { user, job } = await loadJobPage(params)
  // Dates go to the client as the API gives them (ISO strings).
  const initialJob = JSON.parse(JSON.stringify(job)) as JobView
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title={roLabel(job.roNumber)} description={job.customer.name} />
      <JobDetail initialJob={initialJob} canEdit isLead={user.role === "shop_lead" || user.role === "admin"} />
    </div>
  )
}
