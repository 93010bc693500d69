import "server-only"
import { notFound } from "next/navigation"
import { requirePageRole } from "@/app/_server/auth"
import { getDb } from "@/db/client"
import { loadJobDetail } from "@/db/queries/jobs"
import { isUuid } from "@/lib/validation/uuid"

/**
 * The job a job page (its view and its edit form) shows, and who asks: a technician or shop lead of the job's
 * shop. Any other id, or another shop's job, is the not-found page.
 */
export async function loadJobPage(params: Promise<{ jobId: string }>) {
  const user = await requirePageRole("technician", "shop_lead")
  const { jobId } = await params
  if (!isUuid(jobId)) notFound()
  const job = await loadJobDetail(getDb(), jobId, user.shopId)
  if (!job) notFound()
  return { user, job }
}
