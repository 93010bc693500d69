// Page weight: the JavaScript a phone downloads to open the recorder the first time, gzip-compressed, in kB of
// 1000 bytes: every chunk the start screen waits for, as Chromium loads them (issue 10). Needs the running app (BASE_URL) and its
// database (DATABASE_URL) for a throwaway technician to sign in with.
import { gzipSync } from "node:zlib"
import { chromium } from "playwright-core"
import { hourAt10Hz } from "./scoring"
import { benchPerson, benchStack, signInCookie } from "./rig"
import { APP_ENV, atMost, benchFigure } from "./types"

export async function signedInCookie(env: NodeJS.ProcessEnv) {
  const { baseUrl, db, shopId, cleanup } = await benchStack(env, "pages")
  const cookie = await signInCookie(baseUrl, await benchPerson(db, shopId, "technician"), `bench-pages-${process.pid}`)
  return { cookie, cleanup }
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

/**
 * Every script a page asks for before it is interactive, in Chromium: the HTML's own scripts and every chunk
 * they import at once, until React has hydrated `readySelector` (a script asked for by then counts even if
 * it arrives later). Each counted gzip-compressed, as the server would send it.
 */
export async function loadedScriptsGzipBytes(baseUrl: string, path: string, cookie: string, readySelector: string) {
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-dev-shm-usage"],
  })
  try {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, serviceWorkers: "block" })
    const [name, value] = [cookie.slice(0, cookie.indexOf("=")), cookie.slice(cookie.indexOf("=") + 1)]
    await context.addCookies([{ name, value, url: baseUrl }])
    // The moment the element is in the page with React's fiber on it: a mutation observer runs before any
    // timer or idle callback the page could use to load more.
    // (A string, not a function: tsx would wrap a function's inner names in a helper the page does not have.)
    await context.addInitScript(`(() => {
      const sel = ${JSON.stringify(readySelector)}
      new MutationObserver(() => {
        const el = document.querySelector(sel)
        if (!window.__readyAt && el && Object.keys(el).some((k) => k.startsWith("__reactFiber"))) window.__readyAt = performance.now()
      }).observe(document, { childList: true, subtree: true, attributes: true })
    })()`)
    const page = await context.newPage()
    const bodies = new Map<string, Promise<Buffer>>()
    page.on("response", (res) => {
      if (res.request().resourceType() !== "script" || bodies.has(res.url())) return
      const body = res.body()
      body.catch(() => {}) // a script still arriving when the browser closes is one that is not counted
      bodies.set(res.url(), body)
    })
    await page.goto(`${baseUrl}${path}`, { waitUntil: "load" })
    await page.waitForFunction(() => (window as unknown as { __readyAt?: number }).__readyAt !== undefined, null, {
      timeout: 60_000,
    })
    await page.waitForLoadState("networkidle")
    // Every script asked for before that moment counts, even one that arrived after it.
    const asked: string[] = await page.evaluate(() => {
      const readyAt = (window as unknown as { __readyAt: number }).__readyAt
      return performance
        .getEntriesByType("resource")
        .filter((e) => e.startTime <= readyAt)
        .map((e) => e.name)
    })
    let bytes = 0
    let scripts = 0
    for (const [url, body] of bodies) {
      if (!asked.includes(url)) continue
      const n = gzipSync(await body, { level: 9 }).length
      if (process.env.BENCH_LIST) console.error(`[bench]   ${url.slice(-60)} ${n}`)
      bytes += n
      scripts++
    }
    return { bytes, scripts, later: bodies.size - scripts }
  } finally {
    await browser.close()
  }
}

export const recorderFirstLoadKb = benchFigure("recorderFirstLoadKbGzip", atMost(150, "kB"), APP_ENV, async (ctx) => {
  const { cookie, cleanup } = await signedInCookie(ctx.env)
  try {
    const { bytes: htmlOnly } = await firstLoadGzipBytes(ctx.env.BASE_URL!, "/record", cookie)
    // The start screen works once its first step's button is hydrated.
    const { bytes, scripts, later } = await loadedScriptsGzipBytes(
      ctx.env.BASE_URL!,
      "/record",
      cookie,
      '[data-testid="to-gate"]',
    )
    console.error(
      `[bench] /record: ${scripts} scripts before the start screen works (${later} after); the HTML's script tags alone: ${(htmlOnly / 1000).toFixed(1)} kB`,
    )
    return bytes / 1000
  } finally {
    await cleanup()
  }
})

/** The detail page of a finished 36,000-sample drive (1 h at 10 Hz, imported), as a signed-in driver gets it. */
export const detailHtmlKb36k = benchFigure("detailHtmlKb36k", atMost(300, "kB"), APP_ENV, async (ctx) => {
  const baseUrl = ctx.env.BASE_URL!
  const { cookie, cleanup } = await signedInCookie(ctx.env)
  try {
    const { text } = hourAt10Hz(ctx)
    const res = await fetch(`${baseUrl}/api/drives/import`, {
      method: "POST",
      headers: { cookie, "content-type": "application/json" },
      body: text,
    })
    if (res.status !== 201) throw new Error(`import failed: ${res.status} ${await res.text()}`)
    const { drive } = (await res.json()) as { drive: { id: string } }
    const page = await fetch(`${baseUrl}/drives/${drive.id}`, { headers: { cookie } })
    if (!page.ok) throw new Error(`detail page failed: ${page.status}`)
    return Buffer.byteLength(await page.text()) / 1000
  } finally {
    await cleanup()
  }
})
