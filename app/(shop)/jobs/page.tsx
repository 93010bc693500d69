import { Plus } from "lucide-react"
import type { Metadata } from "next"
import Link from "next/link"
import { requirePageRole } from "@/app/_server/auth"
import { JobTable } from "@/components/jobs/job-table"
import { buttonVariants } from "@/components/ui/button"
import { PageHeader } from "@/components/ui/page-header"

export const metadata: Metadata = { title: "Jobs" }

export default async function JobsPage() {
  await requirePageRole("technician", "shop_lead")
  return (
    <>
      <PageHeader
        title="Jobs"
        description="Repair orders and the calibrations on them."
        actions={
          <Link href="/jobs/new" className={buttonVariants({ variant: "signal" })}>
            <Plus aria-hidden className="size-5" /> New job
          </Link>
        }
      />
      <JobTable />
    </>
  )
}
