import { saveTaskSetup, taskSetup } from "@/app/_server/services/tasks"
import { taskRecordRoutes } from "@/app/_server/task-record-routes"
import { setupInputSchema } from "@/lib/setup"

const setup = taskRecordRoutes("setup", setupInputSchema, taskSetup, saveTaskSetup)

/** The task's static set-up record; `setup: null` until someone records it. */
export const GET = setup.GET

/** Records (or corrects) the set-up; new figures withdraw a lead's override. */
export const PUT = setup.PUT
