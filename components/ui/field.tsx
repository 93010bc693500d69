import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react"
import { cn } from "./cn"

const control =
  "block w-full min-h-12 rounded-lg border-2 border-graphite-300 bg-white px-3 text-base text-graphite-900 placeholder:text-graphite-400 focus:border-graphite-700 dark:border-graphite-600 dark:bg-asphalt-800 dark:text-graphite-50"

export function Field({
  label,
  error,
  hint,
  children,
  htmlFor,
}: {
  label: string
  error?: string
  hint?: string
  children: ReactNode
  htmlFor: string
}) {
  return (
    <div className="space-y-1">
      <label htmlFor={htmlFor} className="block text-sm font-semibold text-graphite-700 dark:text-graphite-200">
        {label}
      </label>
      {children}
      {hint && !error ? <p className="text-sm text-graphite-500 dark:text-graphite-300">{hint}</p> : null}
      {error ? (
        <p role="alert" className="text-sm font-medium text-stop-600 dark:text-stop-400">
          {error}
        </p>
      ) : null}
    </div>
  )
}

export function Input({ className, ...props }: InputHTMLAttributes<HTMLInputElement>) {
  return <input className={cn(control, className)} {...props} />
}

export function Select({ className, ...props }: SelectHTMLAttributes<HTMLSelectElement>) {
  return <select className={cn(control, className)} {...props} />
}

export function Textarea({ className, ...props }: TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return <textarea className={cn(control, "min-h-24 py-2", className)} {...props} />
}
