export const ROLES = ["technician", "co_driver", "shop_lead", "admin"] as const
export type Role = (typeof ROLES)[number]

export const ROLE_LABEL: Record<Role, string> = {
  technician: "Technician",
  co_driver: "Co-driver",
  shop_lead: "Shop lead",
  admin: "Admin",
}

/** admin can do everything the other roles can. */
export function hasRole(role: Role, allowed: readonly Role[]) {
  return role === "admin" || allowed.includes(role)
}

/** Where each role lands after signing in. */
export const ROLE_HOME: Record<Role, string> = {
  technician: "/drives",
  co_driver: "/drives",
  shop_lead: "/review",
  admin: "/admin/users",
}
