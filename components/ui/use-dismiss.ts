"use client"

import { useEffect, type RefObject } from "react"

/**
 * While `open`, a press outside every one of `inside` or the Escape key calls `close` (with `"escape"` for the key,
 * so a sheet can give the focus back to the button that opened it).
 */
export function useDismiss(
  open: boolean,
  inside: RefObject<HTMLElement | null>[],
  close: (how: "escape" | "outside") => void,
) {
  useEffect(() => {
    if (!open) return
    const onEvent = (e: MouseEvent | KeyboardEvent) => {
      if (e instanceof KeyboardEvent) {
        if (e.key === "Escape") close("escape")
      } else if (!inside.some((ref) => ref.current?.contains(e.target as Node))) close("outside")
    }
    document.addEventListener("mousedown", onEvent)
    document.addEventListener("keydown", onEvent)
    return () => {
      document.removeEventListener("mousedown", onEvent)
      document.removeEventListener("keydown", onEvent)
    }
    // `inside` and `close` are new on every render; what the listener needs from them is read when it runs.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [open])
}
