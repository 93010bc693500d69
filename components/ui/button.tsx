import { cva, type VariantProps } from "class-variance-authority"
import type { ButtonHTMLAttributes } from "react"
import { cn } from "./cn"

export const buttonVariants = cva(
  "inline-flex min-h-12 items-center justify-center gap-2 rounded-lg px-4 font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-50",
  {
    variants: {
      variant: {
        primary:
          "bg-graphite-900 text-white hover:bg-graphite-700 dark:bg-signal-400 dark:text-graphite-950 dark:hover:bg-signal-300",
        signal: "bg-signal-400 text-graphite-950 hover:bg-signal-300",
        follow: "bg-teal-400 text-graphite-950 hover:bg-teal-300",
        outline:
          "border-2 border-graphite-300 bg-white text-graphite-900 hover:bg-graphite-100 dark:border-graphite-600 dark:bg-transparent dark:text-graphite-50 dark:hover:bg-asphalt-700",
        ghost: "text-graphite-700 hover:bg-graphite-100 dark:text-graphite-200 dark:hover:bg-asphalt-700",
        danger: "bg-stop-600 text-white hover:bg-stop-500",
      },
      size: { md: "text-base", lg: "min-h-16 px-6 text-lg", sm: "min-h-12 px-3 text-sm" },
    },
    defaultVariants: { variant: "primary", size: "md" },
  },
)

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & VariantProps<typeof buttonVariants>

export function Button({ className, variant, size, type = "button", ...props }: ButtonProps) {
  return <button type={type} className={cn(buttonVariants({ variant, size }), className)} {...props} />
}
