import "server-only"
import nodemailer, { type Transporter } from "nodemailer"
import { AppError } from "@/lib/errors"
import { env } from "@/lib/env"

let transport: Transporter | undefined

function isLoopback(url: string) {
  try {
    return ["127.0.0.1", "localhost", "[::1]"].includes(new URL(url).hostname)
  } catch {
    return false
  }
}

/** One SMTP transport per process, from SMTP_URL. The local mail fake speaks no TLS, so it is skipped there. */
function getMailTransport(): Transporter {
  const url = env().SMTP_URL
  if (!url) throw new AppError("conflict", "E-mail is not set up on this server (SMTP_URL is empty).")
  transport ??= nodemailer.createTransport({
    url,
    ignoreTLS: Boolean(env().MAIL_FAKE_URL) || isLoopback(url),
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
  return transport
}

export type OutgoingMail = {
  to: string
  subject: string
  text: string
  attachments?: Array<{ filename: string; contentType: string; content: Uint8Array }>
}

export async function sendMail(mail: OutgoingMail) {
  await getMailTransport().sendMail({
    from: env().MAIL_FROM,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    attachments: mail.attachments?.map((a) => ({
      filename: a.filename,
      contentType: a.contentType,
      content: Buffer.from(a.content),
    })),
  })
}

/** E-mail that must not hold up the request it follows (a redo notice): failures are logged, not thrown. */
export async function sendMailQuietly(mail: OutgoingMail) {
  try {
    await sendMail(mail)
    return true
  } catch (error) {
    console.error("[straightaway] e-mail to %s failed", mail.to, error)
    return false
  }
}

export function mailFakeInUse() {
  return Boolean(env().MAIL_FAKE_URL)
}

export type CapturedMail = {
  to: string[]
  subject: string
  from?: string
  receivedAt?: string
  attachments: Array<{ filename: string; contentType: string; size: number }>
}

/** What the local mail fake has caught, newest first (the fake keeps them in that order). */
export async function listCapturedMail(): Promise<CapturedMail[]> {
  const base = env().MAIL_FAKE_URL
  if (!base) return []
  const res = await fetch(`${base.replace(/\/$/, "")}/messages`, {
    cache: "no-store",
    signal: AbortSignal.timeout(5000),
  })
  if (!res.ok) throw new Error(`mail fake answered ${res.status}`)
  const body = (await res.json()) as { messages?: CapturedMail[] }
  return (body.messages ?? []).map((m) => ({
    to: m.to,
    subject: m.subject,
    from: m.from,
    receivedAt: m.receivedAt,
    attachments: (m.attachments ?? []).map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.size })),
  }))
}
