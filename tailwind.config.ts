import type { Config } from "tailwindcss"

// Straightaway's own palette: graphite and asphalt surfaces, signal amber for qualifying/active,
// cool teal for following, red only for a stop-worthy problem.
export default {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        graphite: {
          50: "#f5f6f7", 100: "#e8eaed", 200: "#d0d4d9", 300: "#aab1ba", 400: "#7d8794", 500: "#5d6773",
          600: "#48515c", 700: "#383f48", 800: "#272c33", 900: "#1a1e23", 950: "#111418",
        },
        asphalt: { 700: "#2f3236", 800: "#232528", 900: "#17181a" },
        signal: { 300: "#ffd27a", 400: "#ffbf3d", 500: "#f5a30a", 600: "#c98000", 700: "#8f5b00" },
        teal: { 300: "#6fe3d6", 400: "#2fcbbb", 500: "#14a89a", 600: "#0e8177", 700: "#0b5f58" },
        stop: { 400: "#ff6b5e", 500: "#e5483a", 600: "#b8342a", 700: "#8a241d" },
      },
      fontFamily: { sans: ["var(--font-inter)", "system-ui", "sans-serif"] },
    },
  },
} satisfies Config
