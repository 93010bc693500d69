import { Inbox, Paperclip, RefreshCw } from "lucide-react"
import type { Metadata } from "next"
import Link from "next/link"
import { requirePageRole } from "@/app/_server/auth"
import { listCapturedMail, mailFakeInUse, type CapturedMail } from "@/app/_server/mail"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { PageHeader } from "@/components/ui/page-header"

export const metadata: Metadata = { title: "Mail" }
export const dynamic = "force-dynamic"

export default async function MailPage() {
  await requirePageRole("admin")
  if (!mailFakeInUse()) {
    return (
      <>
        <PageHeader title="Mail" />
        <Card>Mail goes out through the configured mail service; there is no local copy to show here.</Card>
      </>
    )
  }
  let messages: CapturedMail[] = []
  let problem: string | null = null
  try {
    messages = await listCapturedMail()
  } catch {
    problem = "The local mail catcher is not answering. Is it running?"
  }
  return (
    <>
      <PageHeader
        title="Mail"
        description="What the app has sent while the local mail catcher stands in for a real mail service. Newest first."
        actions={
          <Link href="/admin/mail" className={buttonVariants({ variant: "outline", size: "sm" })}>
            <RefreshCw aria-hidden className="size-4" /> Refresh
          </Link>
        }
      />
      {problem ? (
        <Card role="alert">{problem}</Card>
      ) : messages.length === 0 ? (
        <Card className="flex items-center gap-3">
          <Inbox aria-hidden className="size-6" /> Nothing sent yet.
        </Card>
      ) : (
        <ul className="space-y-2" data-testid="mail-list">
          {messages.map((m, i) => (
            <li key={i}>
              <Card className="space-y-1 p-3">
                <p className="font-semibold">{m.subject || "(no subject)"}</p>
                <p className="text-sm text-graphite-600 dark:text-graphite-300">
                  To {m.to.join(", ")}
                  {m.receivedAt ? ` · ${new Date(m.receivedAt).toISOString().slice(0, 16).replace("T", " ")} UTC` : ""}
                </p>
                {m.attachments.map((a) => (
                  <p key={a.filename} className="inline-flex items-center gap-1 text-sm">
                    <Paperclip aria-hidden className="size-4" /> {a.filename} · {a.contentType} · {Math.round(a.size / 1024)} KB
                  </p>
                ))}
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  )
}
