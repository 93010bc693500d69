"use client"

import { LogOut } from "lucide-react"
import { Button } from "@/components/ui/button"
import { api } from "@/lib/api/client"

export function SignOutButton() {
  async function signOut() {
    await api.signOut().catch(() => null)
    // A full page load on purpose: it drops every client cache (queries, the recorder store) with the session.
    // eslint-disable-next-line @next/next/no-location-assign-relative-destination
    window.location.assign("/sign-in")
  }
  return (
    <Button variant="ghost" size="sm" onClick={signOut} className="min-h-12">
      <LogOut aria-hidden className="size-5" />
      <span>Sign out</span>
    </Button>
  )
}
