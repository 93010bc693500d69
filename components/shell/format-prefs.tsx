"use client"

import { createContext, useContext, type ReactNode } from "react"
import { DEFAULT_PREFS, type FormatPrefs } from "@/lib/format"

const FormatPrefsContext = createContext<FormatPrefs>(DEFAULT_PREFS)

/** Hands the shop's units and time zone to client components, so server and browser write the same text. */
export function FormatPrefsProvider({ prefs, children }: { prefs: FormatPrefs; children: ReactNode }) {
  return <FormatPrefsContext.Provider value={prefs}>{children}</FormatPrefsContext.Provider>
}

export function useFormatPrefs(): FormatPrefs {
  return useContext(FormatPrefsContext)
}
