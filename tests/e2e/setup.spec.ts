import { testDb } from "../helpers/db"
import { signedIn } from "../helpers/http"
import { createJob } from "../helpers/jobs"
import { expect, shopForFile, test, type Page } from "./fixtures"

// The static set-up form on the job page. The figures are invented: Straightaway holds no maker's values, the shop
// types its own from the service information.
const file = shopForFile("Set-up e2e")

/** A job with one static camera calibration, opened by the shop lead over the API. */
async function staticJob() {
  const lead = await signedIn(file.shop.lead)
  const job = await createJob(lead, {
    tasks: [{ sensor: "forward_camera", method: "static", reason: "windshield_replaced" }],
  })
  return { id: job.id as string, taskId: job.tasks[0].id as string }
}

function storedSetup(taskId: string) {
  return testDb()
    .selectFrom("setup_record")
    .select(["measurements", "scan_result", "scan_notes", "override_note", "override_by", "updated_by"])
    .where("task_id", "=", taskId)
    .where("shop_id", "=", file.shop.shopId)
    .executeTakeFirst()
}

/** The job's page opened on `page`, with the set-up form of its first calibration and the form's measurement rows. */
async function openSetupForm<J extends { id: string }>(page: Page, job: J) {
  await page.goto(`/jobs/${job.id}`)
  const form = page.getByTestId("setup-form-0")
  return { job, form, rows: form.getByRole("listitem") }
}

test.describe("the set-up form on a phone", () => {
  test("a technician types the figures, one out of tolerance, saves, and sees the road test held; a bad number is refused beside its box", async ({
    phoneAs,
  }) => {
    const page = await phoneAs(file.shop.tech)
    const { job, form, rows } = await openSetupForm(page, await staticJob())

    await expect(rows).toHaveCount(1)
    await expect(rows.nth(0).getByLabel("Measurement", { exact: true })).toHaveValue("target_distance")
    // A decimal comma reads as a point.
    await rows.nth(0).getByLabel("Measured").fill("1502,5")
    await rows.nth(0).getByLabel("Specified").fill("1500")
    await rows.nth(0).getByLabel("Tolerance (±)").fill("10")
    await expect(rows.nth(0)).toContainText("In tolerance")

    await form.getByRole("button", { name: "Add a measurement" }).click()
    await expect(rows).toHaveCount(2)
    await expect(rows.nth(1).getByLabel("Measurement", { exact: true })).toHaveValue("target_height")
    await rows.nth(1).getByLabel("Measured").fill("1030")
    await rows.nth(1).getByLabel("Specified").fill("1000")
    await expect(rows.nth(1)).not.toContainText(/In tolerance|Out of tolerance/)
    await rows.nth(1).getByLabel("Tolerance (±)").fill("5")
    await expect(rows.nth(1)).toContainText("Out of tolerance")

    // A third row as an other measurement asks for its name; left without figures, it is not saved.
    await form.getByRole("button", { name: "Add a measurement" }).click()
    await expect(rows).toHaveCount(3)
    await expect(rows.nth(2).getByLabel("Name")).toHaveCount(0)
    await rows.nth(2).getByLabel("Measurement", { exact: true }).selectOption("other")
    await expect(rows.nth(2).getByLabel("Name")).toBeVisible()
    // Each row but a lone one can be removed; the third goes and comes back.
    await rows.nth(2).getByRole("button", { name: "Remove measurement 3" }).click()
    await expect(rows).toHaveCount(2)
    await form.getByRole("button", { name: "Add a measurement" }).click()
    await expect(rows).toHaveCount(3)

    await form.getByLabel("Scan tool result").selectOption("fail")
    await form.getByLabel("Scan tool notes").fill("Camera aim code stored after the first try.")
    await expect(form.getByLabel("Lead's override: why the road test may go ahead")).toHaveCount(0)
    await page.getByTestId("setup-save-0").click()

    await expect(form.getByRole("status")).toHaveText("Saved. Out-of-tolerance figures hold the road test.")
    await expect(page.getByTestId("setup-blocks")).toContainText("1 out of tolerance")
    // The form shows what was stored: the blank row dropped, the comma read as a point.
    await expect(rows).toHaveCount(2)
    await expect(rows.nth(0).getByLabel("Measured")).toHaveValue("1502.5")
    await expect(rows.nth(1).getByLabel("Tolerance (±)")).toHaveValue("5")
    await expect(form.getByLabel("Scan tool result")).toHaveValue("fail")
    expect(await storedSetup(job.taskId)).toEqual({
      measurements: [
        { key: "target_distance", value: 1502.5, specified: 1500, tolerance: 10, unit: "mm" },
        { key: "target_height", value: 1030, specified: 1000, tolerance: 5, unit: "mm" },
      ],
      scan_result: "fail",
      scan_notes: "Camera aim code stored after the first try.",
      override_note: null,
      override_by: null,
      updated_by: file.shop.tech.id,
    })
    // A technician may not override.
    await expect(form.getByLabel("Lead's override: why the road test may go ahead")).toHaveCount(0)

    // A typo in a figure: the problem shows beside that box, and nothing is stored.
    const measured = rows.nth(0).getByLabel("Measured")
    await measured.fill("15o2")
    await expect(rows.nth(0)).not.toContainText(/In tolerance|Out of tolerance/)
    await page.getByTestId("setup-save-0").click()
    await expect(measured.locator("xpath=..").getByRole("alert")).toHaveText("must be a number")
    await expect(form.getByRole("status")).toHaveCount(0)
    expect((await storedSetup(job.taskId))?.measurements[0]?.value).toBe(1502.5)

    // Set right, it saves and the problem goes.
    await measured.fill("1503")
    await page.getByTestId("setup-save-0").click()
    await expect(form.getByRole("status")).toHaveText("Saved. Out-of-tolerance figures hold the road test.")
    await expect(measured.locator("xpath=..").getByRole("alert")).toHaveCount(0)
    expect((await storedSetup(job.taskId))?.measurements[0]?.value).toBe(1503)

    // Bringing the height into tolerance lets the road test go.
    await rows.nth(1).getByLabel("Measured").fill("1004")
    await expect(rows.nth(1)).toContainText("In tolerance")
    await page.getByTestId("setup-save-0").click()
    await expect(form.getByRole("status")).toHaveText("Set-up saved.")
    await expect(page.getByTestId("setup-blocks")).toHaveCount(0)
  })

  test("a shop lead overrides figures out of tolerance with a note and sees the override", async ({ phoneAs }) => {
    const job = await staticJob()
    const tech = await signedIn(file.shop.tech)
    const put = await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.taskId}/setup`, {
      measurements: [{ key: "lateral_offset", value: 14, specified: 0, tolerance: 5, unit: "mm" }],
      scanResult: "pass",
    })
    expect(put.status).toBe(200)

    const page = await phoneAs(file.shop.lead)
    const { form, rows } = await openSetupForm(page, job)
    await expect(page.getByTestId("setup-blocks")).toContainText("1 out of tolerance")
    await expect(rows.nth(0).getByLabel("Measured")).toHaveValue("14")
    await expect(rows.nth(0)).toContainText("Out of tolerance")

    const override = form.getByRole("button", { name: "Override with this note" })
    await expect(override).toBeDisabled()
    const note = form.getByLabel("Lead's override: why the road test may go ahead")
    await note.fill("   ")
    await expect(override).toBeDisabled()
    await note.fill("Offset measured twice against the printout; target stand re-squared.")
    await expect(override).toBeEnabled()
    await override.click()

    await expect(form.getByRole("status")).toHaveText("Override saved: the road test may start.")
    await expect(page.getByTestId("setup-override")).toHaveText(
      `Overridden by ${file.shop.lead.name}: Offset measured twice against the printout; target stand re-squared.`,
    )
    await expect(page.getByTestId("setup-blocks")).toHaveCount(0)
    await expect(note).toHaveCount(0)
    const stored = await storedSetup(job.taskId)
    expect(stored?.override_note).toBe("Offset measured twice against the printout; target stand re-squared.")
    expect(stored?.override_by).toBe(file.shop.lead.id)
  })

  test("a problem only the server finds shows beside its box on the right row, blank rows counted", async ({
    phoneAs,
  }) => {
    const page = await phoneAs(file.shop.tech)
    const { job, form, rows } = await openSetupForm(page, await staticJob())
    // The first row stays blank (it is not sent); the second carries text PostgreSQL cannot store (a NUL character),
    // which the API refuses before any schema, naming the second measurement it was sent as its first.
    await form.getByRole("button", { name: "Add a measurement" }).click()
    await rows.nth(1).getByLabel("Measured").fill("1003")
    await rows.nth(1).getByLabel("Specified").fill("1000")
    await rows.nth(1).getByLabel("Tolerance (±)").fill("5")
    const unit = rows.nth(1).getByLabel("Unit")
    await unit.fill("m\u0000m")
    await page.getByTestId("setup-save-0").click()
    await expect(unit.locator("xpath=..").getByRole("alert")).toHaveText("must not contain the NUL character")
    await expect(rows.nth(0).getByRole("alert")).toHaveCount(0)
    await expect(form.getByRole("alert").last()).toHaveText("measurements.0.unit: must not contain the NUL character")
    expect(await storedSetup(job.taskId)).toBeUndefined()

    await unit.fill("mm")
    await page.getByTestId("setup-save-0").click()
    await expect(form.getByRole("status")).toHaveText("Set-up saved.")
    await expect(unit.locator("xpath=..").getByRole("alert")).toHaveCount(0)
    expect((await storedSetup(job.taskId))?.measurements).toEqual([
      { key: "target_height", value: 1003, specified: 1000, tolerance: 5, unit: "mm" },
    ])
  })
})
