import { ArrowLeft } from "lucide-react"
import type { Metadata } from "next"
import Link from "next/link"
import { loadJobPage } from "@/app/_server/job-page"
import { JobForm } from "@/components/jobs/job-form"
import { PageHeader } from "@/components/ui/page-header"
import { roLabel } from "@/lib/record"
import type { Method, Reason, Sensor } from "@/lib/validation/job"

export const metadata: Metadata = { title: "Edit job" }

export default async function EditJobPage({ params }: { params: Promise<{ jobId: string }> }) {
  const { job } = await loadJobPage(params)
  return (
    <div className="mx-auto max-w-3xl">
      <Link
        href={`/jobs/${job.id}`}
        className="mb-2 inline-flex min-h-12 items-center gap-1 text-graphite-700 underline-offset-4 hover:underline dark:text-graphite-200"
      >
        <ArrowLeft aria-hidden className="size-4" /> Back to the job, without saving
      </Link>
      <PageHeader
        title={`Edit ${roLabel(job.roNumber)}`}
        description="Drives already recorded keep the conditions they were held to."
      />
      <JobForm
        jobId={job.id}
        initial={{
          roNumber: job.roNumber,
          customer: { name: job.customer.name, email: job.customer.email ?? "", phone: job.customer.phone ?? "" },
          vehicle: {
            vin: job.vehicle.vin,
            year: job.vehicle.year ?? "",
            make: job.vehicle.make ?? "",
            model: job.vehicle.model ?? "",
            plate: job.vehicle.plate ?? "",
          },
          tasks: job.tasks.map((t) => ({
            id: t.id,
            sensor: t.sensor as Sensor,
            method: t.method as Method,
            reason: t.reason as Reason,
            profileId: t.profile?.id ?? "",
          })),
        }}
      />
    </div>
  )
}
