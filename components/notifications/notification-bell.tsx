"use client"

import { Bell, BellDot } from "lucide-react"
import Link from "next/link"
import { useEffect, useRef, useState } from "react"
import { cn } from "@/components/ui/cn"
import { LocalTime } from "@/components/ui/local-time"
import { useDismiss } from "@/components/ui/use-dismiss"
import { api } from "@/lib/api/client"
import type { NoticeList, Wire } from "@/lib/api/types"

type Notice = Wire<NoticeList>["notifications"][number]

const POLL_MS = 60_000

/** The latest notices and the unread count; null when offline or refused (keep what is shown; the next poll tries again). */
function fetchNotices(): Promise<Wire<NoticeList> | null> {
  return api.notices().catch(() => null)
}

/** The header's bell: unread count as a number badge, the latest notices in a panel, read on open. */
export function NotificationBell({ className }: { className?: string }) {
  const [notices, setNotices] = useState<Notice[]>([])
  const [unread, setUnread] = useState(0)
  const [open, setOpen] = useState(false)
  const panel = useRef<HTMLDivElement>(null)

  useEffect(() => {
    let live = true
    const load = () =>
      fetchNotices().then((json) => {
        if (!live || !json) return
        setNotices(json.notifications)
        setUnread(json.unread)
      })
    void load()
    const timer = setInterval(() => void load(), POLL_MS)
    return () => {
      live = false
      clearInterval(timer)
    }
  }, [])

  useDismiss(open, [panel], () => setOpen(false))

  async function toggle() {
    const next = !open
    setOpen(next)
    if (next && unread > 0) {
      setUnread(0)
      await api.markAllNoticesRead().catch(() => null)
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
          <span
            className="absolute top-1 right-1 min-w-5 rounded-full bg-signal-400 px-1 text-center tabular text-xs font-bold text-graphite-950"
            data-testid="notification-count"
          >
            {unread > 99 ? "99+" : unread}
          </span>
        ) : null}
      </button>
      {open ? (
        // Phones: pinned under the header across the screen (anchored to the bell it would run off the left
        // edge); wide screens: dropped from the bell.
        <div
          className="fixed inset-x-3 top-16 z-30 rounded-xl border border-graphite-200 bg-white p-2 shadow-lg sm:absolute sm:inset-x-auto sm:top-full sm:right-0 sm:mt-1 sm:w-96 dark:border-asphalt-700 dark:bg-asphalt-800"
          role="dialog"
          aria-label="Notices"
          data-testid="notification-panel"
        >
          <p className="px-2 pt-1 pb-2 font-semibold">Notices</p>
          {notices.length === 0 ? (
            <p className="px-2 pb-2 text-sm text-graphite-600 dark:text-graphite-300">
              Nothing new. Drives waiting for review and records sent show up here.
            </p>
          ) : (
            <ul className="max-h-[60dvh] divide-y divide-graphite-100 overflow-y-auto dark:divide-asphalt-700">
              {notices.map((n) => {
                const body = (
                  <>
                    <span className={cn("block text-sm", !n.readAt && "font-semibold")}>
                      {!n.readAt ? (
                        <span className="mr-1.5 inline-block rounded bg-signal-400 px-1 text-xs font-bold text-graphite-950">
                          New
                        </span>
                      ) : null}
                      {n.message}
                    </span>
                    <span className="block text-xs text-graphite-600 dark:text-graphite-300">
                      <LocalTime iso={n.createdAt} />
                    </span>
                  </>
                )
                return (
                  <li key={n.id}>
                    {n.link ? (
                      <Link
                        href={n.link}
                        onClick={() => setOpen(false)}
                        className="block rounded-lg p-2 hover:bg-graphite-100 dark:hover:bg-asphalt-700"
                      >
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
