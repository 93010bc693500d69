import type { Metadata, Viewport } from "next"
import localFont from "next/font/local"
import { headers } from "next/headers"
import type { ReactNode } from "react"
import { ZodJitless } from "@/components/zod-jitless"
import "./globals.css"

const inter = localFont({ src: "./fonts/inter-latin-wght.woff2", variable: "--font-inter", display: "swap", weight: "100 900" })

export const metadata: Metadata = {
  title: { default: "Straightaway", template: "%s · Straightaway" },
  description: "Record, score and document ADAS calibration drives.",
  applicationName: "Straightaway",
  appleWebApp: { capable: true, title: "Straightaway", statusBarStyle: "black-translucent" },
}

export const viewport: Viewport = {
  width: "device-width",
  initialScale: 1,
  viewportFit: "cover",
  themeColor: [
    { media: "(prefers-color-scheme: light)", color: "#f5f6f7" },
    { media: "(prefers-color-scheme: dark)", color: "#17181a" },
  ],
}

// The theme choice is read before paint so a night-time visit never flashes white.
const themeScript = `try{var t=localStorage.getItem("straightaway-theme");if(t==="dark"||(!t&&matchMedia("(prefers-color-scheme: dark)").matches))document.documentElement.classList.add("dark")}catch(e){}`

export default async function RootLayout({ children }: { children: ReactNode }) {
  // The nonce of this response's content security policy (proxy.ts); reading it renders every page per request.
  const nonce = (await headers()).get("x-nonce") ?? undefined
  return (
    <html lang="en" className={inter.variable} suppressHydrationWarning>
      <head>
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: themeScript }} />
      </head>
      <body className="min-h-dvh font-sans">
        <ZodJitless />
        {children}
      </body>
    </html>
  )
}
