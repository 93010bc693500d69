import type { HTMLAttributes } from "react"
import { cn } from "./cn"

export function Card({ className, ...props }: HTMLAttributes<HTMLDivElement>) {
  return (
    <div
      className={cn(
        "rounded-xl border border-graphite-200 bg-white p-4 shadow-sm dark:border-asphalt-700 dark:bg-asphalt-800",
        className,
      )}
      {...props}
    />
  )
}
