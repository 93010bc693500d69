import type { Config } from "tailwindcss"

// The palette lives in app/globals.css (@theme), so utilities read CSS variables and the recorder's sun mode
// (app/(cab)/sun.css) can swap them.
export default {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      fontFamily: { sans: ["var(--font-inter)", "system-ui", "sans-serif"] },
    },
  },
} satisfies Config
