import type { Metadata, Viewport } from "next"
import type { ReactNode } from "react"
import { requirePageRole } from "@/app/_server/auth"
import { getFormatPrefs } from "@/app/_server/format-prefs"
import { CabRoot } from "@/components/cab/cab-root"
import { ServiceWorkerRegistration } from "@/components/pwa/service-worker-registration"
import { FormatPrefsProvider } from "@/components/shell/format-prefs"
import "./sun.css"

export const dynamic = "force-dynamic"

export const metadata: Metadata = { title: "Recorder" }
export const viewport: Viewport = { themeColor: "#17181a" }

/**
 * The cab: dark, full screen, no navigation bar; usable at night without glare. Sun mode for bright daylight.
 * The shop's units come with the page, so the page the service worker saves for offline carries them too; a drive
 * also keeps the units it started with (DriveMeta.units in IndexedDB).
 */
export default async function CabLayout({ children }: { children: ReactNode }) {
  const user = await requirePageRole()
  const prefs = await getFormatPrefs(user.shopId)
  return (
    <FormatPrefsProvider prefs={prefs}>
      <CabRoot>
        <main className="mx-auto max-w-xl px-3 pt-2 pb-[max(1rem,env(safe-area-inset-bottom))]">{children}</main>
        <ServiceWorkerRegistration />
      </CabRoot>
    </FormatPrefsProvider>
  )
}
