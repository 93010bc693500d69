"use client"

import { Moon, Sun } from "lucide-react"
import { useEffect, useState } from "react"
import { Button } from "@/components/ui/button"

export function ThemeToggle() {
  const [dark, setDark] = useState(false)
  useEffect(() => setDark(document.documentElement.classList.contains("dark")), [])
  function toggle() {
    const next = !dark
    document.documentElement.classList.toggle("dark", next)
    localStorage.setItem("straightaway-theme", next ? "dark" : "light")
    setDark(next)
  }
  return (
    <Button variant="ghost" size="sm" onClick={toggle} aria-label={dark ? "Use the light theme" : "Use the dark theme"} className="min-h-12 min-w-12">
      {dark ? <Sun aria-hidden className="size-5" /> : <Moon aria-hidden className="size-5" />}
    </Button>
  )
}
