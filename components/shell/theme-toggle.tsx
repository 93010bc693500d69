"use client"

import { Moon, Sun } from "lucide-react"
import { useSyncExternalStore } from "react"
import { Button } from "@/components/ui/button"

// The theme lives on <html class="dark"> (set before paint by the layout's inline script); read it from there.
function watchTheme(onChange: () => void) {
  const observer = new MutationObserver(onChange)
  observer.observe(document.documentElement, { attributes: true, attributeFilter: ["class"] })
  return () => observer.disconnect()
}
const isDark = () => document.documentElement.classList.contains("dark")

export function ThemeToggle() {
  const dark = useSyncExternalStore(watchTheme, isDark, () => false)
  function toggle() {
    const next = !dark
    document.documentElement.classList.toggle("dark", next)
    localStorage.setItem("straightaway-theme", next ? "dark" : "light")
  }
  return (
    <Button
      variant="ghost"
      size="sm"
      onClick={toggle}
      aria-label={dark ? "Use the light theme" : "Use the dark theme"}
      className="min-h-12 min-w-12"
    >
      {dark ? <Sun aria-hidden className="size-5" /> : <Moon aria-hidden className="size-5" />}
    </Button>
  )
}
