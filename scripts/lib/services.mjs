import crypto from "node:crypto"
import fs from "node:fs"
import path from "node:path"
import { fork } from "node:child_process"
import { log, root } from "./shell.mjs"

/** Environment for the app's hosted-service clients, pointed at the local fakes. */
export function fakeServiceEnv({ s3Port, smtpPort }) {
  return {
    S3_ENDPOINT: `http://127.0.0.1:${s3Port}`,
    S3_REGION: "us-east-1",
    S3_BUCKET: "straightaway",
    S3_ACCESS_KEY_ID: "S3RVER",
    S3_SECRET_ACCESS_KEY: "S3RVER",
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    MAIL_FAKE_URL: `http://127.0.0.1:${smtpPort + 1}`,
    MAIL_FROM: "Straightaway <records@straightaway.invalid>",
  }
}

export function startFakes({ s3Port, smtpPort, dir }) {
  return new Promise((resolve, reject) => {
    const child = fork(path.join(root, "scripts", "fakes.mjs"), [], {
      cwd: root,
      env: { ...process.env, S3_PORT: String(s3Port), SMTP_PORT: String(smtpPort), FAKES_DIR: dir },
      stdio: process.env.STRAIGHTAWAY_LOG_STDERR === "1" ? ["inherit", 2, 2, "ipc"] : "inherit",
    })
    child.once("message", () => resolve(child))
    child.once("exit", (code) => reject(new Error(`the local fakes exited (${code})`)))
  })
}

/** A secret for signing share links, kept between runs so old links stay valid. */
export function appSecret(dataDir) {
  if (process.env.APP_SECRET) return process.env.APP_SECRET
  const file = path.join(dataDir, "app-secret")
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true })
    fs.writeFileSync(file, crypto.randomBytes(32).toString("base64url"), { mode: 0o600 })
    log(`Made a new APP_SECRET in ${file}`)
  }
  return fs.readFileSync(file, "utf8").trim()
}
