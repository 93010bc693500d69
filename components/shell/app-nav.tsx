"use client"

import {
  BarChart3,
  CircleDot,
  ClipboardCheck,
  Mail,
  Map as MapIcon,
  Menu,
  Route,
  Settings,
  SlidersHorizontal,
  Users,
  Wrench,
  type LucideIcon,
} from "lucide-react"
import Link from "next/link"
import { usePathname } from "next/navigation"
import { useEffect, useRef, useState } from "react"
import { cn } from "@/components/ui/cn"
import { useDismiss } from "@/components/ui/use-dismiss"
import { BOTTOM_BAR_SLOTS, type NavItem } from "./nav-items"

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
  settings: Settings,
}

function useActive() {
  const pathname = usePathname()
  return (href: string) => pathname === href || pathname.startsWith(`${href}/`)
}

/** One entry of the menu, wherever it is drawn: the page's icon and word, marked as the current page when it is. */
function NavLink({
  item,
  active,
  className,
  activeClassName,
  iconClassName = "size-5",
  onClick,
}: {
  item: NavItem
  active: boolean
  className: string
  activeClassName: string
  iconClassName?: string
  onClick?: () => void
}) {
  const Icon = ICONS[item.icon] ?? Route
  return (
    <Link
      href={item.href}
      aria-current={active ? "page" : undefined}
      onClick={onClick}
      className={cn(className, active && activeClassName)}
    >
      <Icon aria-hidden className={iconClassName} />
      {item.label}
    </Link>
  )
}

/** Side rail on wide screens. */
export function SideNav({ items }: { items: NavItem[] }) {
  const isActive = useActive()
  return (
    <nav aria-label="Main" className="hidden w-56 shrink-0 flex-col gap-1 p-3 md:flex">
      {items.map((item) => (
        <NavLink
          key={item.href}
          item={item}
          active={isActive(item.href)}
          className="flex min-h-12 items-center gap-3 rounded-lg px-3 font-medium text-graphite-700 hover:bg-graphite-100 dark:text-graphite-200 dark:hover:bg-asphalt-700"
          activeClassName="bg-graphite-900 text-white hover:bg-graphite-800 dark:bg-signal-400 dark:text-graphite-950 dark:hover:bg-signal-300"
        />
      ))}
    </nav>
  )
}

/** Bottom bar on phones: thumb reach, one hand. More entries than fit go in a "More" sheet, so every page is a tap or two away. */
export function BottomNav({ items }: { items: NavItem[] }) {
  const isActive = useActive()
  const overflow = items.length > BOTTOM_BAR_SLOTS
  const shown = overflow ? items.slice(0, BOTTOM_BAR_SLOTS - 1) : items
  const more = overflow ? items.slice(BOTTOM_BAR_SLOTS - 1) : []
  const columns = shown.length + (overflow ? 1 : 0)
  return (
    <nav
      aria-label="Main"
      className="fixed inset-x-0 bottom-0 z-30 border-t border-graphite-200 bg-white/95 pb-[env(safe-area-inset-bottom)] backdrop-blur md:hidden dark:border-asphalt-700 dark:bg-asphalt-900/95"
    >
      <ul className="grid" style={{ gridTemplateColumns: `repeat(${columns}, minmax(0, 1fr))` }}>
        {shown.map((item) => {
          const active = isActive(item.href)
          return (
            <li key={item.href}>
              <NavLink
                item={item}
                active={active}
                className="flex min-h-16 flex-col items-center justify-center gap-1 text-xs font-semibold text-graphite-500 dark:text-graphite-300"
                activeClassName="text-graphite-950 dark:text-signal-300"
                iconClassName={cn("size-6", active && "stroke-[2.5]")}
              />
            </li>
          )
        })}
        {overflow ? (
          <li>
            <MoreSheet items={more} active={more.some((i) => isActive(i.href))} isActive={isActive} />
          </li>
        ) : null}
      </ul>
    </nav>
  )
}

function MoreSheet({
  items,
  active,
  isActive,
}: {
  items: NavItem[]
  active: boolean
  isActive: (href: string) => boolean
}) {
  const [open, setOpen] = useState(false)
  const sheet = useRef<HTMLDivElement>(null)
  const button = useRef<HTMLButtonElement>(null)
  useEffect(() => {
    if (open) sheet.current?.querySelector("a")?.focus()
  }, [open])
  useDismiss(open, [sheet, button], (how) => {
    setOpen(false)
    if (how === "escape") button.current?.focus()
  })
  return (
    <>
      <button
        ref={button}
        type="button"
        aria-expanded={open}
        aria-controls="more-sheet"
        onClick={() => setOpen((o) => !o)}
        className={cn(
          "flex min-h-16 w-full flex-col items-center justify-center gap-1 text-xs font-semibold text-graphite-500 dark:text-graphite-300",
          (active || open) && "text-graphite-950 dark:text-signal-300",
        )}
        data-testid="nav-more"
      >
        <Menu aria-hidden className={cn("size-6", active && "stroke-[2.5]")} />
        More
      </button>
      {open ? (
        <div
          ref={sheet}
          id="more-sheet"
          role="dialog"
          aria-label="More pages"
          className="fixed inset-x-0 bottom-[calc(4rem+env(safe-area-inset-bottom))] z-40 rounded-t-2xl border-t border-graphite-200 bg-white p-2 shadow-lg dark:border-asphalt-700 dark:bg-asphalt-800"
          data-testid="more-sheet"
        >
          <ul className="grid gap-1">
            {items.map((item) => (
              <li key={item.href}>
                <NavLink
                  item={item}
                  active={isActive(item.href)}
                  onClick={() => setOpen(false)}
                  className="flex min-h-12 items-center gap-3 rounded-lg px-3 font-medium text-graphite-800 hover:bg-graphite-100 dark:text-graphite-100 dark:hover:bg-asphalt-700"
                  activeClassName="bg-graphite-900 text-white dark:bg-signal-400 dark:text-graphite-950"
                />
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </>
  )
}
