"use client"

import { LogOut } from "lucide-react"
import { Button } from "@/components/ui/button"

export function SignOutButton() {
  async function signOut() {
    await fetch("/api/session", { method: "DELETE" }).catch(() => null)
    window.location.assign("/sign-in")
  }
  return (
    <Button variant="ghost" size="sm" onClick={signOut} className="min-h-12">
      <LogOut aria-hidden className="size-5" />
      <span>Sign out</span>
    </Button>
  )
}
