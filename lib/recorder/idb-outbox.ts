// IndexedDB (idb-keyval) storage for the drive being recorded and its outbox.
import { createStore, del, delMany, get, getMany, keys, set, setMany, type UseStore } from "idb-keyval"
import type { ApiMark, Sample } from "@/lib/drive-file/schema"
import type { Score } from "@/lib/scoring/types"
import type { UnitSystem } from "@/lib/format"
import type { ResolvedProfile } from "@/lib/drive-file/profile"
import type { OutboxItem, OutboxStore } from "./outbox"

export interface DriveMeta {
  id: string
  profile: ResolvedProfile
  startedAtMs: number
  vehicleDescription: string | null
  jobId: string | null
  taskId: string | null
  label: string
  status: "recording" | "finishing" | "finished"
  finishedScore?: Score
  finishedLocally?: boolean
  /** A second phone logging marks only: it watches position for speed but records no samples. */
  role?: "driver" | "co-driver"
  /** The shop's units when the drive started: the meters read in them offline too (older drives: the page's). */
  units?: UnitSystem
}

let store: UseStore | undefined
function db(): UseStore {
  store ??= createStore("straightaway-recorder", "kv")
  return store
}

const OUTBOX = "outbox:"
const sampleKey = (driveId: string, seq: number) => `samples:${driveId}:${String(seq).padStart(9, "0")}`

export const idbOutbox: OutboxStore = {
  async list() {
    const all = (await keys(db())).filter((k): k is string => typeof k === "string" && k.startsWith(OUTBOX))
    return (await getMany<OutboxItem | undefined>(all, db())).filter((i): i is OutboxItem => i !== undefined)
  },
  async remove(list) {
    await delMany(
      list.map((k) => OUTBOX + k),
      db(),
    )
  },
  async put(items) {
    await setMany(
      items.map((i) => [OUTBOX + i.key, i]),
      db(),
    )
  },
}

/** One piece of samples and its outbox item in one IndexedDB transaction. */
export async function persistSamples(driveId: string, seq: number, samples: Sample[], item: OutboxItem) {
  await setMany(
    [
      [sampleKey(driveId, seq), samples],
      [OUTBOX + item.key, item],
    ],
    db(),
  )
}

export async function loadSamples(driveId: string): Promise<{ samples: Sample[]; nextSeq: number }> {
  const prefix = `samples:${driveId}:`
  const list = (await keys(db())).filter((k): k is string => typeof k === "string" && k.startsWith(prefix)).sort()
  const pieces = await getMany<Sample[] | undefined>(list, db())
  const last = list.at(-1)
  return { samples: pieces.flatMap((p) => p ?? []), nextSeq: last ? Number(last.slice(prefix.length)) + 1 : 0 }
}

export const saveMeta = (meta: DriveMeta) => set(`drive:${meta.id}`, meta, db())
export const loadMeta = (id: string) => get<DriveMeta>(`drive:${id}`, db())
export const saveMarks = (driveId: string, marks: ApiMark[]) => set(`marks:${driveId}`, marks, db())
/** Marks other phones logged on the drive, as the live channel brought them, and where it left off. */
export interface RemoteMarks {
  marks: ApiMark[]
  lastEventId: number | null
}
export const saveRemoteMarks = (driveId: string, remote: RemoteMarks) => set(`remote:${driveId}`, remote, db())
export const loadRemoteMarks = async (driveId: string) =>
  (await get<RemoteMarks>(`remote:${driveId}`, db())) ?? { marks: [], lastEventId: null }
export const loadMarks = async (driveId: string) => (await get<ApiMark[]>(`marks:${driveId}`, db())) ?? []
export const saveOutboxItems = (items: OutboxItem[]) => idbOutbox.put(items)
export const setActiveDrive = (id: string | null) => (id ? set("active", id, db()) : del("active", db()))
export const getActiveDrive = () => get<string>("active", db())
export const setLastSynced = (ms: number) => set("lastSynced", ms, db())
export const getLastSynced = () => get<number>("lastSynced", db())
