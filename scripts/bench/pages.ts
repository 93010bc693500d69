// Page weight: the JavaScript a phone downloads to open the recorder the first time, gzip-compressed
// (Next's former "First Load JS" measure, in kB of 1000 bytes). Needs the running app (BASE_URL) and its
// database (DATABASE_URL) for a throwaway technician to sign in with.
import { randomUUID } from "node:crypto"
import { gzipSync } from "node:zlib"
import { createDb } from "@/db/client"
import { hashPassword } from "@/lib/auth/password"
import type { BenchFigure } from "./types"

async function signedInCookie(baseUrl: string, databaseUrl: string) {
  const db = createDb(databaseUrl)
  const { id: shopId } = await db.insertInto("shop").values({ name: `Bench pages ${randomUUID().slice(0, 8)}`, settings: "{}" }).returning("id").executeTakeFirstOrThrow()
  const password = `bench-${randomUUID()}`
  const email = `bench-pages-${randomUUID().slice(0, 8)}@bench.invalid`
  await db.insertInto("app_user").values({ id: randomUUID(), shop_id: shopId, email, name: "Bench", role: "technician", password_hash: await hashPassword(password) }).execute()
  const res = await fetch(`${baseUrl}/api/session`, {
    method: "POST",
    headers: { "content-type": "application/json", "x-forwarded-for": `bench-pages-${process.pid}` },
    body: JSON.stringify({ email, password }),
  })
  if (!res.ok) throw new Error(`bench sign-in failed: ${res.status}`)
  const cookie = res.headers.get("set-cookie")!.split(";")[0]!
  return {
    cookie,
    async cleanup() {
      await db.deleteFrom("shop").where("id", "=", shopId).execute()
      await db.destroy()
    },
  }
}

/** Sum of the gzip sizes of the scripts a page's HTML loads (modern browsers skip `nomodule` ones). */
export async function firstLoadGzipBytes(baseUrl: string, path: string, cookie: string) {
  const html = await (await fetch(`${baseUrl}${path}`, { headers: { cookie } })).text()
  const srcs = new Set<string>()
  for (const tag of html.match(/<script\b[^>]*>/g) ?? []) {
    if (/\bnomodule\b/i.test(tag)) continue
    const src = /\bsrc="([^"]+)"/.exec(tag)?.[1]
    if (src) srcs.add(src.replace(/&amp;/g, "&"))
  }
  let bytes = 0
  for (const src of srcs) {
    const body = Buffer.from(await (await fetch(new URL(src, baseUrl))).arrayBuffer())
    bytes += gzipSync(body, { level: 9 }).length
  }
  return { bytes, scripts: srcs.size }
}

export const recorderFirstLoadKb: BenchFigure = {
  name: "recorderFirstLoadKbGzip",
  target: "<= 150",
  unit: "kB",
  requiresEnv: ["BASE_URL", "DATABASE_URL"],
  async run(ctx) {
    const { cookie, cleanup } = await signedInCookie(ctx.env.BASE_URL!, ctx.env.DATABASE_URL!)
    try {
      const { bytes } = await firstLoadGzipBytes(ctx.env.BASE_URL!, "/record", cookie)
      return bytes / 1000
    } finally {
      await cleanup()
    }
  },
  meets: (v) => v <= 150,
}
