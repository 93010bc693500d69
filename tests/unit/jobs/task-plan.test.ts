import { describe, expect, it } from "vitest"
import { planTaskReplacement } from "@/lib/jobs/tasks"

const existing = [
  { id: "t1", profile_id: "p-radar" },
  { id: "t2", profile_id: null },
]

describe("replacing a job's calibrations", () => {
  it("keeps a listed task's profile unless a new one is named, and treats a task without an id as new", () => {
    const plan = planTaskReplacement(existing, [
      { id: "t1" },
      { id: "t2", profileId: "p-cam" },
      { profileId: undefined },
    ])
    expect(plan.unknownIds).toEqual({})
    expect(plan.removed).toEqual([])
    expect(plan.tasks.map((t) => t.profileId)).toEqual(["p-radar", "p-cam", undefined])
  })

  it("removes the tasks the new list leaves out", () => {
    expect(planTaskReplacement(existing, [{ id: "t2" }]).removed).toEqual(["t1"])
    expect(planTaskReplacement(existing, []).removed).toEqual(["t1", "t2"])
  })

  it("names, by position, an id that is not a task of this job", () => {
    const plan = planTaskReplacement(existing, [{ id: "t1" }, { id: "elsewhere" }])
    expect(plan.unknownIds).toEqual({ "tasks.1.id": "is not a task of this job" })
    expect(plan.removed).toEqual(["t2"])
  })

  it("lets a named null profile clear the profile of an existing task", () => {
    expect(planTaskReplacement(existing, [{ id: "t1", profileId: null }]).tasks[0]?.profileId).toBeNull()
  })
})
