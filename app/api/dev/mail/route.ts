import { requireRole } from "@/app/_server/auth"
import { listCapturedMail, mailFakeInUse } from "@/app/_server/mail"
import { route } from "@/app/_server/route"
import { AppError } from "@/lib/errors"

// Only while the local mail fake catches the mail; on a real mail service this route does not exist.
export const GET = route(async () => {
  await requireRole()
  if (!mailFakeInUse()) throw new AppError("not_found", "That was not found.")
  await requireRole("admin")
  return Response.json({ messages: await listCapturedMail() }, { headers: { "cache-control": "no-store" } })
})
