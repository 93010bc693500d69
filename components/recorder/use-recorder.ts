"use client"
import { useStore } from "zustand"
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
