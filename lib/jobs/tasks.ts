// What replacing a job's list of calibrations does to the tasks it holds: pure, so it is checked without a database.

type ExistingTask = { id: string; profile_id: string | null }
type IncomingTask = { id?: string | undefined; profileId?: string | null | undefined }

export type TaskPlan<T extends IncomingTask> = {
  /** Field errors, keyed `tasks.<i>.id`, for ids that are not tasks of this job. */
  unknownIds: Record<string, string>
  /** Ids of the tasks the new list leaves out. */
  removed: string[]
  /** The new list, each existing task keeping its profile unless one is named. */
  tasks: (T & { profileId?: string | null | undefined })[]
}

/**
 * Tasks keep their id; a task missing from the new list is removed; a task without an id is new. An existing task
 * keeps its profile unless the list names one (a new task gets the shop's default, as at intake).
 */
export function planTaskReplacement<T extends IncomingTask>(existing: ExistingTask[], incoming: T[]): TaskPlan<T> {
  const byId = new Map(existing.map((e) => [e.id, e]))
  const unknownIds: Record<string, string> = {}
  incoming.forEach((t, i) => {
    if (t.id && !byId.has(t.id)) unknownIds[`tasks.${i}.id`] = "is not a task of this job"
  })
  const kept = new Set(incoming.flatMap((t) => (t.id ? [t.id] : [])))
  const removed = existing.filter((e) => !kept.has(e.id)).map((e) => e.id)
  const tasks = incoming.map((t) => {
    const before = t.id ? byId.get(t.id) : undefined
    return before && t.profileId === undefined ? { ...t, profileId: before.profile_id } : t
  })
  return { unknownIds, removed, tasks }
}
