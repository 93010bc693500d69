"use client"

import {
  BarChart3,
  CircleDot,
  ClipboardCheck,
  Mail,
  Map as MapIcon,
  Route,
  SlidersHorizontal,
  Users,
  Wrench,
  type LucideIcon,
} from "lucide-react"
import Link from "next/link"
import { usePathname } from "next/navigation"
import { cn } from "@/components/ui/cn"
import type { NavItem } from "./nav-items"

const ICONS: Record<string, LucideIcon> = {
  "clipboard-check": ClipboardCheck,
  route: Route,
  "circle-dot": CircleDot,
  wrench: Wrench,
  chart: BarChart3,
  sliders: SlidersHorizontal,
  users: Users,
  mail: Mail,
  map: MapIcon,
}

function useActive() {
  const pathname = usePathname()
  return (href: string) => pathname === href || pathname.startsWith(`${href}/`)
}

/** Side rail on wide screens. */
export function SideNav({ items }: { items: NavItem[] }) {
  const isActive = useActive()
  return (
    <nav aria-label="Main" className="hidden w-56 shrink-0 flex-col gap-1 p-3 md:flex">
      {items.map((item) => {
        const Icon = ICONS[item.icon] ?? Route
        const active = isActive(item.href)
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={active ? "page" : undefined}
            className={cn(
              "flex min-h-12 items-center gap-3 rounded-lg px-3 font-medium text-graphite-700 hover:bg-graphite-100 dark:text-graphite-200 dark:hover:bg-asphalt-700",
              active && "bg-graphite-900 text-white hover:bg-graphite-800 dark:bg-signal-400 dark:text-graphite-950 dark:hover:bg-signal-300",
            )}
          >
            <Icon aria-hidden className="size-5" />
            {item.label}
          </Link>
        )
      })}
    </nav>
  )
}

/** Bottom bar on phones: thumb reach, one hand. */
export function BottomNav({ items }: { items: NavItem[] }) {
  const isActive = useActive()
  const shown = items.slice(0, 5)
  return (
    <nav
      aria-label="Main"
      className="fixed inset-x-0 bottom-0 z-30 border-t border-graphite-200 bg-white/95 pb-[env(safe-area-inset-bottom)] backdrop-blur md:hidden dark:border-asphalt-700 dark:bg-asphalt-900/95"
    >
      <ul className="grid" style={{ gridTemplateColumns: `repeat(${shown.length}, minmax(0, 1fr))` }}>
        {shown.map((item) => {
          const Icon = ICONS[item.icon] ?? Route
          const active = isActive(item.href)
          return (
            <li key={item.href}>
              <Link
                href={item.href}
                aria-current={active ? "page" : undefined}
                className={cn(
                  "flex min-h-16 flex-col items-center justify-center gap-1 text-xs font-semibold text-graphite-500 dark:text-graphite-300",
                  active && "text-graphite-950 dark:text-signal-300",
                )}
              >
                <Icon aria-hidden className={cn("size-6", active && "stroke-[2.5]")} />
                {item.label}
              </Link>
            </li>
          )
        })}
      </ul>
    </nav>
  )
}
