import { deflateSync } from "node:zlib"
import { withCheckDigit } from "@/lib/vin"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { expect, signInPage, test } from "./fixtures"
let shop: TestShop

test.beforeAll(async () => {
  shop = await createTestShop("E2E jobs")
})

function crc32(bytes: Buffer) {
  let c = ~0
  for (const b of bytes) {
    c ^= b
    for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1
  }
  return ~c >>> 0
}

/** A small solid-colour PNG made here (signature, IHDR, IDAT, IEND), so the test needs no fixture file. */
function makePng(width: number, height: number, rgb: [number, number, number]) {
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, "latin1"), data])
    const out = Buffer.alloc(8 + data.length + 4)
    out.writeUInt32BE(data.length, 0)
    body.copy(out, 4)
    out.writeUInt32BE(crc32(body), 8 + data.length)
    return out
  }
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(width, 0)
  ihdr.writeUInt32BE(height, 4)
  ihdr[8] = 8 // bit depth
  ihdr[9] = 2 // truecolour
  const row = Buffer.concat([Buffer.from([0]), Buffer.from(Array.from({ length: width }, () => rgb).flat())])
  const raw = Buffer.concat(Array.from({ length: height }, () => row))
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", ihdr),
    chunk("IDAT", deflateSync(raw)),
    chunk("IEND", Buffer.alloc(0)),
  ])
}

test.describe("a job on a phone", () => {
  test("creates a job with a VIN, fills the checklist with a photo, and starts a drive from it", async ({ phone }) => {
    const context = await phone()
    const page = await context.newPage()
    await signInPage(page, shop.tech)

    await page.goto("/jobs/new")
    const ro = `E2E-${Date.now()}`
    await page.getByLabel("RO number").fill(ro)
    await page.getByLabel("Customer name").fill("Odile Pennant")
    // An invented VIN: position 7 'C' (alphabetic) and position 10 'S' make it a 2025 (49 CFR 565.15(b) cycle).
    const vin = withCheckDigit("0ZW7MPC4?S2718406")
    const wrongDigit = vin[8] === "0" ? "1" : "0"
    const vinBox = page.getByLabel("VIN")
    await vinBox.fill(vin.slice(0, 8) + wrongDigit + vin.slice(9))
    await page.getByText(`check digit works out to ${vin[8]}`).waitFor()
    await vinBox.fill(vin.slice(0, 10))
    await page.getByText("VIN has 10 characters; it needs 17.").waitFor()
    await vinBox.fill(vin)
    await page.getByText(/Check digit .* is right/).waitFor()
    // Position 10 'S' is 1995 or 2025 (49 CFR 565 year-code table); position 7 settles it only for light vehicles,
    // so the form shows both and asks, the light-vehicle year first.
    await page.getByText("Model year 2025 or 1995?").waitFor()
    await page.getByTestId("vin-year-2025").click()
    expect(await page.locator("#vehicle-year").inputValue()).toBe("2025")
    await page.getByLabel("Make").fill("Halvard")
    await page.getByLabel("Model").fill("Ostra")
    await page.getByLabel("Why").selectOption("windshield_replaced")
    await page.getByRole("button", { name: "Open the job" }).click()
    await page.waitForURL(/\/jobs\/[0-9a-f-]{36}$/)
    const jobId = new URL(page.url()).pathname.split("/").pop()!
    await page.getByRole("heading", { name: `RO ${ro}` }).waitFor()
    expect(await page.getByTestId("job-vin").textContent()).toBe(vin)

    // Checklist: a low tire is flagged while typing, then set right.
    await page.getByLabel("No fault codes stored").check()
    await page.getByLabel("Door placard").fill("35")
    await page.getByLabel("Front left (psi)").fill("35")
    await page.getByLabel("Front right (psi)").fill("30")
    await page.getByTestId("tire-flag-fr").getByText("5 psi under").waitFor()
    await page.getByLabel("Front right (psi)").fill("34")
    await page.getByLabel("Rear left (psi)").fill("35")
    await page.getByLabel("Rear right (psi)").fill("36")
    await page.getByLabel("Load normal").check()
    await page.getByLabel("Fuel").selectOption("3/4")
    await page.getByLabel("Sensor face clean").check()
    await page.getByLabel("Mount and bracket undamaged").check()
    await page.getByLabel("Notes").fill("Glass replaced, camera bracket reused.")
    expect(await page.getByTestId("start-drive").count()).toBe(0)
    await page.getByRole("button", { name: "Save checklist" }).click()
    await page.getByText("Before the drive: ready").waitFor()
    await expect(page.getByTestId("checklist-stamp")).toContainText(`Saved by ${shop.tech.name}`)

    // A photo through the presigned upload.
    await page
      .getByLabel("Add photos or a PDF")
      .setInputFiles({ name: "bracket.png", mimeType: "image/png", buffer: makePng(32, 24, [200, 120, 40]) })
    const thumb = page.getByTestId("attachment").locator("img")
    await thumb.waitFor()
    await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(32)

    const stored = await testDb()
      .selectFrom("checklist")
      .select(["completed_by", "data"])
      .where("shop_id", "=", shop.shopId)
      .execute()
    expect(stored).toHaveLength(1)
    expect(stored[0]!.completed_by).toBe(shop.tech.id)
    const attachments = await testDb()
      .selectFrom("attachment")
      .select(["status", "content_type"])
      .where("job_id", "=", jobId)
      .execute()
    expect(attachments).toEqual([{ status: "complete", content_type: "image/png" }])

    // Start a drive: the recorder opens with the job and task in the address.
    const taskId = (
      await testDb().selectFrom("job_task").select("id").where("job_id", "=", jobId).executeTakeFirstOrThrow()
    ).id
    const link = page.getByTestId("start-drive")
    expect(await link.getAttribute("href")).toBe(`/record?jobId=${jobId}&taskId=${taskId}`)
    await link.click()
    await page.waitForURL((url) => url.pathname === "/record")
    const url = new URL(page.url())
    expect(url.searchParams.get("jobId")).toBe(jobId)
    expect(url.searchParams.get("taskId")).toBe(taskId)
    // The recorder lists the job among those it can drive for.
    await expect
      .poll(() => page.locator(`select[aria-label=Job] option[value="${jobId}"]`).count(), { timeout: 15_000 })
      .toBe(1)
  })

  test("lists the job in the table, found by search", async ({ phone }) => {
    const context = await phone()
    const page = await context.newPage()
    await signInPage(page, shop.lead)
    await page.goto("/jobs")
    await page.getByLabel("Search jobs").fill("Pennant")
    await expect.poll(() => page.getByTestId("job-row").count()).toBe(1)
    await page.getByTestId("job-row").getByRole("link").click()
    await page.waitForURL(/\/jobs\/[0-9a-f-]{36}$/)
  })
})
