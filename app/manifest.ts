import type { MetadataRoute } from "next"

export default function manifest(): MetadataRoute.Manifest {
  return {
    id: "/",
    name: "Straightaway: calibration drive recorder",
    short_name: "Straightaway",
    description: "Record, score and document ADAS calibration drives.",
    start_url: "/record",
    scope: "/",
    display: "standalone",
    orientation: "portrait",
    background_color: "#17181a",
    theme_color: "#17181a",
    categories: ["business", "productivity", "utilities"],
    icons: [
      { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/icon-maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
    ],
  }
}
