import { Inbox, Paperclip, RefreshCw } from "lucide-react"
import type { Metadata } from "next"
import Link from "next/link"
import { requirePageRole } from "@/app/_server/auth"
import { listCapturedMail, mailFakeInUse, type CapturedMail } from "@/app/_server/mail"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { LocalTime } from "@/components/ui/local-time"
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
        <ul className="max-w-3xl space-y-2" data-testid="mail-list">
          {messages.map((m, i) => (
            <li key={i}>
              <Card className="space-y-1 p-3">
                <p className="font-semibold">{m.subject || "(no subject)"}</p>
                <p className="text-sm break-words text-graphite-600 dark:text-graphite-300">
                  To {m.to.join(", ")}
                  {m.receivedAt ? (
                    <>
                      {" · "}
                      <LocalTime iso={new Date(m.receivedAt).toISOString()} />
                    </>
                  ) : null}
                </p>
                {m.attachments.length ? (
                  <ul className="space-y-0.5 text-sm">
                    {m.attachments.map((a) => (
                      <li key={a.filename} className="flex items-start gap-1.5">
                        <Paperclip aria-hidden className="mt-0.5 size-4 shrink-0" />
                        <span className="min-w-0 break-all">
                          {a.filename}{" "}
                          <span className="text-graphite-600 dark:text-graphite-300">
                            · {Math.max(1, Math.round(a.size / 1024))} KB
                          </span>
                        </span>
                      </li>
                    ))}
                  </ul>
                ) : null}
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  )
}
