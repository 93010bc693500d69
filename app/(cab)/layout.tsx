import type { Metadata, Viewport } from "next"
import type { ReactNode } from "react"
import { requirePageRole } from "@/app/_server/auth"
import { ServiceWorkerRegistration } from "@/components/pwa/service-worker-registration"

export const dynamic = "force-dynamic"

export const metadata: Metadata = { title: "Recorder" }
export const viewport: Viewport = { themeColor: "#17181a" }

/** The cab: dark, full screen, no navigation bar; usable at night without glare. */
export default async function CabLayout({ children }: { children: ReactNode }) {
  await requirePageRole()
  return (
    <div className="dark min-h-dvh bg-asphalt-900 text-graphite-50">
      <main className="mx-auto max-w-xl px-3 pt-[max(0.75rem,env(safe-area-inset-top))] pb-[max(1rem,env(safe-area-inset-bottom))]">
        {children}
      </main>
      <ServiceWorkerRegistration />
    </div>
  )
}
