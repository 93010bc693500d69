import { PDFParse } from "pdf-parse"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { insertJob, insertScoredDrive } from "../integration/review/fixtures"
import { expect, test } from "./fixtures"

let shop: TestShop

test.beforeAll(async () => {
  shop = await createTestShop("E2EReview")
})

test.describe("reviewing a drive on a phone", () => {
  test("sends a short drive back with a note, sees it leave the queue, and opens the record", async ({ phoneAs }) => {
    const job = await insertJob(shop)
    const short = await insertScoredDrive(shop, {
      pattern: "short",
      seed: 601,
      job,
      finishedAt: new Date(Date.now() - 3_600_000),
    })
    const other = await insertScoredDrive(shop, {
      pattern: "never-cleared",
      seed: 602,
      finishedAt: new Date(Date.now() - 1_800_000),
    })
    expect(short.score.verdict).toBe("short")

    const page = await phoneAs(shop.lead)
    expect(new URL(page.url()).pathname).toBe("/review")

    const item = page.locator(`li[data-drive-id="${short.id}"]`)
    await item.waitFor()
    await expect(item.locator("[data-verdict]")).toHaveAttribute("data-verdict", "short")
    expect(await page.locator(`li[data-drive-id="${other.id}"]`).count()).toBe(1)
    await item.getByRole("link").click()
    await page.waitForURL(`**/drives/${short.id}`)

    await page.getByTestId("speed-chart").waitFor()
    expect(await page.getByTestId("track-svg").count()).toBe(1)
    await expect(page.locator('[data-condition="qualifying-time"]')).toContainText("Not met")

    // Sending back without a note is stopped with a plain message.
    await page.getByRole("button", { name: "Send back" }).click()
    await page.getByRole("alert").filter({ hasText: "Write a note" }).waitFor()

    const note = "Only a few minutes at speed; take the highway loop and follow at 120-150 ft."
    await page.getByLabel("Note for the technician").fill(note)
    await page.getByRole("button", { name: "Send back" }).click()
    await page.waitForURL("**/review")
    await page.locator(`li[data-drive-id="${other.id}"]`).waitFor()
    expect(await page.locator(`li[data-drive-id="${short.id}"]`).count()).toBe(0)

    const row = await testDb()
      .selectFrom("drive")
      .select("review_status")
      .where("id", "=", short.internalId)
      .executeTakeFirstOrThrow()
    expect(row.review_status).toBe("redo")

    // The decision shows on the drive, and the record opens as a PDF holding the VIN.
    await page.goto(`/drives/${short.id}`)
    await expect(page.getByTestId("review-decision")).toContainText(note)
    const href = await page.getByTestId("open-record").getAttribute("href")
    expect(href).toBe(`/api/drives/${short.id}/record`)
    const pdf = await page.context().request.get(href!)
    expect(pdf.status()).toBe(200)
    expect(pdf.headers()["content-type"]).toBe("application/pdf")
    const parser = new PDFParse({ data: await pdf.body() })
    const text = (await parser.getText()).text
    await parser.destroy()
    expect(text).toContain(job.vin)
    expect(text).toContain("Sent back for another drive")
  })
})
