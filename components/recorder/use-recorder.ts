"use client"
import { useStore } from "zustand"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import type { UnitSystem } from "@/lib/format"
import { createRecorder, type Recorder, type RecorderState } from "@/lib/recorder/recorder"

let recorder: Recorder | undefined
/** One recorder per tab: the outbox and the position watch must not run twice. */
export function getRecorder(): Recorder {
  recorder ??= createRecorder()
  return recorder
}

export function useRecorder<T>(select: (s: RecorderState) => T): T {
  return useStore(getRecorder().store, select)
}

/** The units the crew reads: the ones the drive started with (kept in IndexedDB), else the shop's from the page. */
export function useRecorderUnits(): UnitSystem {
  const page = useFormatPrefs().units
  const kept = useRecorder((s) => s.meta?.units)
  return kept ?? page
}
