import { saveTaskChecklist, taskChecklist } from "@/app/_server/services/tasks"
import { taskRecordRoutes } from "@/app/_server/task-record-routes"
import { checklistSchema } from "@/lib/validation/checklist"

const checklist = taskRecordRoutes("checklist", checklistSchema, taskChecklist, saveTaskChecklist)

/** The task's pre-drive checklist; `checklist: null` until someone fills it in. */
export const GET = checklist.GET

/** Fills in (or corrects) the checklist. */
export const PUT = checklist.PUT
