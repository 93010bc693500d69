"use client"

import { Bell, BellDot } from "lucide-react"
import Link from "next/link"
import { useCallback, useEffect, useRef, useState } from "react"
import { cn } from "@/components/ui/cn"

type Notice = { id: string; message: string; link: string | null; readAt: string | null; createdAt: string }

const POLL_MS = 60_000

/** The header's bell: unread count as a number badge, the latest notices in a panel, read on open. */
export function NotificationBell({ className }: { className?: string }) {
  const [notices, setNotices] = useState<Notice[]>([])
  const [unread, setUnread] = useState(0)
  const [open, setOpen] = useState(false)
  const panel = useRef<HTMLDivElement>(null)

  const load = useCallback(async () => {
    try {
      const res = await fetch("/api/notifications", { cache: "no-store" })
      if (!res.ok) return
      const json = (await res.json()) as { notifications: Notice[]; unread: number }
      setNotices(json.notifications)
      setUnread(json.unread)
    } catch {
      // Offline: keep what we have; the next poll tries again.
    }
  }, [])

  useEffect(() => {
    void load()
    const timer = setInterval(() => void load(), POLL_MS)
    return () => clearInterval(timer)
  }, [load])

  useEffect(() => {
    if (!open) return
    const close = (e: MouseEvent | KeyboardEvent) => {
      if (e instanceof KeyboardEvent ? e.key === "Escape" : !panel.current?.contains(e.target as Node)) setOpen(false)
    }
    document.addEventListener("mousedown", close)
    document.addEventListener("keydown", close)
    return () => {
      document.removeEventListener("mousedown", close)
      document.removeEventListener("keydown", close)
    }
  }, [open])

  async function toggle() {
    const next = !open
    setOpen(next)
    if (next && unread > 0) {
      setUnread(0)
      await fetch("/api/notifications", { method: "PATCH", headers: { "content-type": "application/json" }, body: JSON.stringify({ all: true }) }).catch(() => null)
    }
  }

  const Icon = unread > 0 ? BellDot : Bell
  return (
    <div className={cn("relative", className)} ref={panel}>
      <button
        type="button"
        onClick={toggle}
        aria-expanded={open}
        aria-label={unread > 0 ? `Notices, ${unread} unread` : "Notices"}
        className="relative inline-flex size-12 items-center justify-center rounded-lg text-graphite-700 hover:bg-graphite-100 dark:text-graphite-200 dark:hover:bg-asphalt-700"
        data-testid="notification-bell"
      >
        <Icon aria-hidden className="size-6" />
        {unread > 0 ? (
          <span className="tabular absolute top-1 right-1 min-w-5 rounded-full bg-signal-400 px-1 text-center text-xs font-bold text-graphite-950" data-testid="notification-count">
            {unread > 99 ? "99+" : unread}
          </span>
        ) : null}
      </button>
      {open ? (
        <div className="absolute right-0 z-30 mt-1 w-80 max-w-[calc(100vw-1.5rem)] rounded-xl border border-graphite-200 bg-white p-2 shadow-lg dark:border-asphalt-700 dark:bg-asphalt-800" role="dialog" aria-label="Notices">
          {notices.length === 0 ? (
            <p className="p-3 text-sm text-graphite-600 dark:text-graphite-300">No notices.</p>
          ) : (
            <ul className="max-h-96 divide-y divide-graphite-100 overflow-y-auto dark:divide-asphalt-700">
              {notices.map((n) => {
                const body = (
                  <>
                    <span className={cn("block text-sm", !n.readAt && "font-semibold")}>{n.message}</span>
                    <span className="block text-xs text-graphite-500 dark:text-graphite-300">{new Date(n.createdAt).toLocaleString()}</span>
                  </>
                )
                return (
                  <li key={n.id}>
                    {n.link ? (
                      <Link href={n.link} onClick={() => setOpen(false)} className="block rounded-lg p-2 hover:bg-graphite-100 dark:hover:bg-asphalt-700">
                        {body}
                      </Link>
                    ) : (
                      <div className="p-2">{body}</div>
                    )}
                  </li>
                )
              })}
            </ul>
          )}
        </div>
      ) : null}
    </div>
  )
}
