// The job status flow is the product's own rule (open -> drive -> review | complete; redo reopens): no outside source.
import { describe, expect, it } from "vitest"
import { jobStatusFromDrives, type JobDriveRow } from "@/lib/access/drive"

const met: JobDriveRow = { task_id: "t1", status: "finished", verdict: "met", review_status: null, harsh_events: "0" }

describe("jobStatusFromDrives", () => {
  it("completes a job whose only dynamic task has a met drive without harsh events", () => {
    expect(jobStatusFromDrives({ tasks: [{ id: "t1", method: "dynamic" }], drives: [met] })).toBe("complete")
  })

  it("holds each task to its latest drive, so a later short drive sends the job to review", () => {
    const short: JobDriveRow = { ...met, verdict: "short" }
    expect(jobStatusFromDrives({ tasks: [{ id: "t1", method: "dynamic" }], drives: [met, short] })).toBe("review")
    expect(jobStatusFromDrives({ tasks: [{ id: "t1", method: "dynamic" }], drives: [short, met] })).toBe("complete")
  })

  it("reads a harsh-event count that the driver returns as text (pg does for bigint) as a number", () => {
    expect(
      jobStatusFromDrives({ tasks: [{ id: "t1", method: "dynamic" }], drives: [{ ...met, harsh_events: "2" }] }),
    ).toBe("review")
  })

  it("keeps the job driving while another task that needs a drive has none; a static task needs none", () => {
    const tasks = [
      { id: "t1", method: "dynamic" },
      { id: "t2", method: "both" },
    ]
    expect(jobStatusFromDrives({ tasks, drives: [met] })).toBe("drive")
    expect(jobStatusFromDrives({ tasks: [tasks[0]!, { id: "t2", method: "static" }], drives: [met] })).toBe("complete")
  })

  it("counts an approved drive as done and a drive without a task against the job as a whole", () => {
    const approved: JobDriveRow = { ...met, verdict: "not_met", review_status: "approved" }
    expect(jobStatusFromDrives({ tasks: [{ id: "t1", method: "dynamic" }], drives: [approved] })).toBe("complete")
    const loose: JobDriveRow = { ...met, task_id: null, verdict: "unverified" }
    expect(jobStatusFromDrives({ tasks: [{ id: "t1", method: "dynamic" }], drives: [met, loose] })).toBe("review")
    expect(jobStatusFromDrives({ tasks: [], drives: [loose] })).toBe("review")
  })
})
