import type { Role } from "@/lib/auth/roles"

export type NavItem = { href: string; label: string; icon: string; roles: Role[] }

// admin sees everything; the order is the order on the bar.
const NAV_ITEMS: NavItem[] = [
  { href: "/review", label: "Review", icon: "clipboard-check", roles: ["shop_lead"] },
  { href: "/drives", label: "Drives", icon: "route", roles: ["technician", "co_driver", "shop_lead"] },
  { href: "/record", label: "Record", icon: "circle-dot", roles: ["technician", "shop_lead"] },
  { href: "/jobs", label: "Jobs", icon: "wrench", roles: ["technician", "shop_lead"] },
  { href: "/numbers", label: "Numbers", icon: "chart", roles: ["shop_lead"] },
  { href: "/roads", label: "Roads", icon: "map", roles: ["technician", "shop_lead"] },
  { href: "/profiles", label: "Profiles", icon: "sliders", roles: ["technician", "shop_lead"] },
  { href: "/admin/users", label: "People", icon: "users", roles: [] },
  { href: "/admin/mail", label: "Mail", icon: "mail", roles: [] },
  { href: "/settings", label: "Settings", icon: "settings", roles: ["shop_lead"] },
]

/** How many entries the phone's bottom bar holds; past that the last place is "More", a sheet with the rest. */
export const BOTTOM_BAR_SLOTS = 5

export function navItemsFor(role: Role) {
  return NAV_ITEMS.filter((item) => role === "admin" || item.roles.includes(role))
}
