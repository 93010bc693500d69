// Local stand-ins for the hosted services, on loopback only: an S3-compatible object store (s3rver) and an
// SMTP server that keeps what it receives and lists it over HTTP for GET /api/dev/mail and the tests.
import fs from "node:fs"
import http from "node:http"
import path from "node:path"
import { simpleParser } from "mailparser"
import S3rver from "s3rver"
import { SMTPServer } from "smtp-server"

const host = "127.0.0.1"
const s3Port = Number(process.env.S3_PORT ?? 4569)
const smtpPort = Number(process.env.SMTP_PORT ?? 2525)
const mailApiPort = Number(process.env.MAIL_API_PORT ?? smtpPort + 1)
const dir = path.resolve(process.env.FAKES_DIR ?? ".data/fakes")
const bucket = process.env.S3_BUCKET ?? "straightaway"

fs.mkdirSync(path.join(dir, "s3"), { recursive: true })

const corsXml = `<CORSConfiguration><CORSRule>
<AllowedOrigin>*</AllowedOrigin><AllowedMethod>GET</AllowedMethod><AllowedMethod>PUT</AllowedMethod>
<AllowedMethod>HEAD</AllowedMethod><AllowedHeader>*</AllowedHeader><ExposeHeader>ETag</ExposeHeader>
<MaxAgeSeconds>3000</MaxAgeSeconds></CORSRule></CORSConfiguration>`

const s3 = new S3rver({
  port: s3Port,
  address: host,
  silent: true,
  directory: path.join(dir, "s3"),
  configureBuckets: [{ name: bucket, configs: [corsXml] }],
})
await s3.run()

const messages = []
const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  logger: false,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        messages.unshift({
          id: mail.messageId ?? `${Date.now()}-${messages.length}`,
          receivedAt: new Date().toISOString(),
          from: mail.from?.text ?? "",
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: mail.subject ?? "",
          text: mail.text ?? "",
          attachments: (mail.attachments ?? []).map((a) => ({
            filename: a.filename ?? "",
            contentType: a.contentType,
            size: a.size,
          })),
        })
        if (messages.length > 500) messages.length = 500
        callback()
      })
      .catch(callback)
  },
})
await new Promise((resolve) => smtp.listen(smtpPort, host, resolve))

const mailApi = http.createServer((req, res) => {
  if (req.method === "GET" && req.url === "/messages") {
    res.writeHead(200, { "content-type": "application/json" })
    res.end(JSON.stringify({ messages }))
  } else if (req.method === "DELETE" && req.url === "/messages") {
    messages.length = 0
    res.writeHead(204).end()
  } else {
    res.writeHead(404).end()
  }
})
await new Promise((resolve) => mailApi.listen(mailApiPort, host, resolve))

process.stdout.write(
  `[straightaway] Fakes ready: S3 on ${host}:${s3Port}, SMTP on ${host}:${smtpPort}, mail list on ${host}:${mailApiPort}\n`,
)
process.send?.({ ready: true })

const stop = async () => {
  await Promise.allSettled([s3.close(), new Promise((r) => smtp.close(r)), new Promise((r) => mailApi.close(r))])
  process.exit(0)
}
process.on("SIGTERM", stop)
process.on("SIGINT", stop)
