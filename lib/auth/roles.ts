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

/**
 * Why an admin may not make this change to a person, or null when they may. An admin never disables themself nor
 * takes away their own admin role: the shop would be left with no one who can undo it.
 */
export function refusedPersonChange(
  actorId: string,
  targetId: string,
  change: { role?: Role | undefined; disabled?: boolean | undefined },
): string | null {
  if (actorId !== targetId) return null
  if (change.disabled || (change.role && change.role !== "admin"))
    return "You cannot disable yourself or take away your own admin role."
  return null
}
