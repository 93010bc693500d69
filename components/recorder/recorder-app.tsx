"use client"
import { lazy, Suspense, useEffect, useState } from "react"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { afterIdle } from "@/components/ui/after-idle"
import { apiFetch } from "@/lib/api/client"
import type { ResolvedProfile } from "@/lib/drive-file/profile"
import { formatTime } from "@/lib/format"
import { getActiveDrive } from "@/lib/recorder/idb-outbox"
import type { DriveMeta } from "@/lib/recorder/idb-outbox"
import { StartFlow, type StartChoice } from "./start-flow"

// The recording engine (scoring, outbox, position watch) loads right after the first paint instead of with it:
// the start flow does not need it, and the recorder's first load stays inside its budget. A visit online
// fetches it, so the worker has it cached for a drive that goes offline.
const loadRecorder = () => import("./use-recorder").then((m) => m.getRecorder())

// Split off: the start flow is what a first visit needs; these load (from the worker's cache offline) when used.
const RecordingScreen = lazy(() => import("./recording-screen").then((m) => ({ default: m.RecordingScreen })))
const FinishScreen = lazy(() => import("./finish-screen").then((m) => ({ default: m.FinishScreen })))
const opening = <p className="text-graphite-300">Opening the recorder…</p>

/** How often, and how many times, a co-driver's phone looks for a drive the server does not have yet (5 min). */
const CO_DRIVER_LOOK_EVERY_MS = 5_000
const CO_DRIVER_LOOKS = 60

/** The drive id lives in the address (`/record?drive=...`) so that a reload, online or not, finds the drive. */
function driveIdFromLocation(): string | null {
  const url = new URL(window.location.href)
  const fromQuery = url.searchParams.get("drive")
  if (fromQuery) return fromQuery
  const m = /^\/record\/([0-9a-f-]{36})/i.exec(url.pathname)
  return m ? m[1]! : null
}

export function RecorderApp({ coDriver = false }: { coDriver?: boolean }) {
  const [meta, setMeta] = useState<DriveMeta | null>(null)
  const [phase, setPhase] = useState<"loading" | "start" | "drive" | "looking" | "missing">("loading")
  const { units, timeZone } = useFormatPrefs()

  useEffect(() => {
    let unsubscribe = () => {}
    let gone = false
    const onOnline = () => void loadRecorder().then((r) => r.online())
    const onOffline = () => void loadRecorder().then((r) => r.offline())
    const onHide = () => void loadRecorder().then((r) => r.persistBuffer(true))
    window.addEventListener("online", onOnline)
    window.addEventListener("offline", onOffline)
    window.addEventListener("pagehide", onHide)
    void (async () => {
      // Nothing to resume: the start screen needs none of the engine, which follows once the screen is up.
      const fresh = !coDriver && !driveIdFromLocation() && !(await getActiveDrive())
      if (fresh) {
        setPhase("start")
        await afterIdle()
      }
      const recorder = await loadRecorder()
      if (gone) return
      setMeta(recorder.store.getState().meta)
      unsubscribe = recorder.store.subscribe((s, before) => {
        if (s.meta !== before.meta) setMeta(s.meta)
      })
      if (fresh) {
        void recorder.flush() // anything left from an earlier drive goes out on app start
        return
      }
      const id = driveIdFromLocation() ?? (coDriver ? null : await getActiveDrive()) ?? null
      if (id && (await recorder.load(id))) {
        if (!driveIdFromLocation()) window.history.replaceState(null, "", `/record?drive=${id}`)
        setPhase("drive")
        return
      }
      if (coDriver && id) {
        // The driver's phone may still be sending the drive (started in the bay on a weak signal, or a moment ago):
        // a drive the server does not have yet is looked for again every few seconds, for a while.
        for (let attempt = 0; !gone; attempt++) {
          const body = await apiFetch<{ drive?: { profile: ResolvedProfile; vehicleDescription: string | null } }>(
            `/api/drives/${id}`,
          ).catch(() => null)
          if (gone) return
          if (body?.drive) {
            await recorder.joinAsCoDriver(id, body.drive.profile, body.drive.vehicleDescription ?? "Drive", units)
            setPhase("drive")
            return
          }
          const lookingAgain = attempt + 1 < CO_DRIVER_LOOKS
          setPhase(lookingAgain ? "looking" : "missing")
          if (!lookingAgain) return
          await new Promise((resolve) => setTimeout(resolve, CO_DRIVER_LOOK_EVERY_MS))
        }
        return
      }
      void recorder.flush() // anything left from an earlier drive goes out on app start
      setPhase("start")
    })()
    return () => {
      gone = true
      unsubscribe()
      window.removeEventListener("online", onOnline)
      window.removeEventListener("offline", onOffline)
      window.removeEventListener("pagehide", onHide)
    }
  }, [coDriver, units])

  // A co-driver's own phone hears from the live channel when the driver has finished the drive.
  const [driverFinished, setDriverFinished] = useState<string | null>(null)
  useEffect(() => {
    if (!coDriver || phase !== "drive") return
    let unsubscribe = () => {}
    void loadRecorder().then((r) => {
      const check = () => {
        const info = r.store.getState().driveInfo
        if (info?.status === "finished") setDriverFinished(info.finishedAt ?? new Date().toISOString())
      }
      check()
      unsubscribe = r.store.subscribe(check)
    })
    return () => unsubscribe()
  }, [coDriver, phase])

  async function start(choice: StartChoice) {
    const id = crypto.randomUUID()
    window.history.replaceState(null, "", `/record?drive=${id}`)
    await (await loadRecorder()).start({ id, ...choice, units })
    setPhase("drive")
  }

  if (phase === "loading") return <p className="text-graphite-300">Opening the recorder…</p>
  if (phase === "looking")
    return (
      <p className="text-graphite-300" data-testid="looking-for-drive" role="status">
        Waiting for this drive to reach the server from the driver&apos;s phone. This phone looks again every few
        seconds; keep it open.{" "}
        <a href="/drives" className="font-semibold text-graphite-50 underline">
          Back to drives
        </a>
      </p>
    )
  if (phase === "missing")
    return (
      <p className="text-graphite-300" data-testid="not-yours">
        This drive is not one you can log marks on, or it has not reached the server yet.{" "}
        <a href="/drives" className="font-semibold text-graphite-50 underline">
          Back to drives
        </a>
      </p>
    )
  if (phase === "start") return <StartFlow onStart={(c) => void start(c)} />
  if (meta && meta.status !== "recording" && meta.role !== "co-driver") {
    return (
      <Suspense fallback={opening}>
        <FinishScreen
          onNewDrive={() => {
            window.history.replaceState(null, "", "/record")
            window.location.reload()
          }}
        />
      </Suspense>
    )
  }
  return (
    <>
      {driverFinished ? (
        <p
          role="status"
          className="mb-3 rounded-xl border-2 border-teal-400 bg-asphalt-800 p-3 font-semibold"
          data-testid="driver-finished"
        >
          The driver finished this drive at {formatTime(driverFinished, timeZone)}. The drive takes no new marks; marks
          this phone logged during the drive still go to the server.
        </p>
      ) : null}
      <Suspense fallback={opening}>
        <RecordingScreen />
      </Suspense>
    </>
  )
}
