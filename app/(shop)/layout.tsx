import Link from "next/link"
import type { ReactNode } from "react"
import { requirePageRole } from "@/app/_server/auth"
import { getFormatPrefs } from "@/app/_server/format-prefs"
import { NotificationBell } from "@/components/notifications/notification-bell"
import { ServiceWorkerRegistration } from "@/components/pwa/service-worker-registration"
import { BottomNav, SideNav } from "@/components/shell/app-nav"
import { FormatPrefsProvider } from "@/components/shell/format-prefs"
import { Logo } from "@/components/shell/logo"
import { navItemsFor } from "@/components/shell/nav-items"
import { QueryProvider } from "@/components/shell/query-provider"
import { SignOutButton } from "@/components/shell/sign-out-button"
import { ThemeToggle } from "@/components/shell/theme-toggle"
import { ROLE_LABEL } from "@/lib/auth/roles"

export const dynamic = "force-dynamic"

export default async function ShopLayout({ children }: { children: ReactNode }) {
  const user = await requirePageRole()
  const items = navItemsFor(user.role)
  const prefs = await getFormatPrefs(user.shopId)
  return (
    <FormatPrefsProvider prefs={prefs}>
      <div className="flex min-h-dvh flex-col">
        <header className="sticky top-0 z-20 flex items-center justify-between gap-2 border-b border-graphite-200 bg-white/95 px-3 py-1 backdrop-blur dark:border-asphalt-700 dark:bg-asphalt-900/95">
          <Link href="/" className="flex min-h-12 items-center gap-2 font-bold tracking-tight">
            <Logo className="size-8" />
            <span>Straightaway</span>
          </Link>
          <div className="flex items-center gap-1">
            <span
              className="hidden text-sm text-graphite-600 sm:inline dark:text-graphite-300"
              data-testid="signed-in-as"
            >
              {user.name} · {ROLE_LABEL[user.role]}
            </span>
            <NotificationBell />
            <ThemeToggle />
            <SignOutButton />
          </div>
        </header>
        <div className="flex flex-1">
          <SideNav items={items} />
          <main className="min-w-0 flex-1 px-4 pt-4 pb-24 md:pb-8">
            <QueryProvider>{children}</QueryProvider>
          </main>
        </div>
        <BottomNav items={items} />
        <ServiceWorkerRegistration />
      </div>
    </FormatPrefsProvider>
  )
}
