import type { Metadata, Viewport } from "next"
import localFont from "next/font/local"
import { headers } from "next/headers"
import type { ReactNode } from "react"
import "./globals.css"

const inter = localFont({
  src: "./fonts/inter-latin-wght.woff2",
  variable: "--font-inter",
  display: "swap",
  weight: "100 900",
})

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
// Zod 4 probes `new Function` once to decide whether to compile its parsers; under the content security policy
// (no 'unsafe-eval') the probe is reported as a violation, though Zod falls back. `jitless` skips the probe. It is
// set through the object Zod itself keeps on globalThis (`__zod_globalConfig`, read by zod/v4/core's `config()`),
// here in the browser only: importing zod's core for it put 5 kB gzip on every page's first load, the recorder's
// included, and, rendered on the server, it turned the server's zod jitless too (slower API validation).
const zodScript = `(globalThis.__zod_globalConfig||(globalThis.__zod_globalConfig={})).jitless=true;`
const themeScript = `${zodScript}try{var t=localStorage.getItem("straightaway-theme");if(t==="dark"||(!t&&matchMedia("(prefers-color-scheme: dark)").matches))document.documentElement.classList.add("dark")}catch(e){}`

export default async function RootLayout({ children }: { children: ReactNode }) {
  // The nonce of this response's content security policy (proxy.ts); reading it renders every page per request.
  const nonce = (await headers()).get("x-nonce") ?? undefined
  return (
    <html lang="en" className={inter.variable} suppressHydrationWarning>
      <head>
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: themeScript }} />
      </head>
      <body className="min-h-dvh font-sans">{children}</body>
    </html>
  )
}
