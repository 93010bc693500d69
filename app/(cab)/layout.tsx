import type { Metadata, Viewport } from "next"
import type { ReactNode } from "react"
import { requirePageRole } from "@/app/_server/auth"
import { CabRoot } from "@/components/cab/cab-root"
import { ServiceWorkerRegistration } from "@/components/pwa/service-worker-registration"
import "./sun.css"

export const dynamic = "force-dynamic"

export const metadata: Metadata = { title: "Recorder" }
export const viewport: Viewport = { themeColor: "#17181a" }

/** The cab: dark, full screen, no navigation bar; usable at night without glare. Sun mode for bright daylight. */
export default async function CabLayout({ children }: { children: ReactNode }) {
  await requirePageRole()
  return (
    <CabRoot>
      <main className="mx-auto max-w-xl px-3 pt-2 pb-[max(1rem,env(safe-area-inset-bottom))]">{children}</main>
      <ServiceWorkerRegistration />
    </CabRoot>
  )
}
