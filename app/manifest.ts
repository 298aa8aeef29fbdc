import type { MetadataRoute } from "next";

// Installable on a phone's home screen; opens straight to today's round.
export default function manifest(): MetadataRoute.Manifest {
  return {
    id: "/today",
    name: "Rimebook",
    short_name: "Rimebook",
    description: "Cold-moist stratification records: plan, label, check, pull, sow and count, with or without signal.",
    start_url: "/today",
    scope: "/",
    display: "standalone",
    orientation: "portrait",
    theme_color: "#1f4d6c",
    background_color: "#f4f8fa",
    categories: ["productivity", "utilities"],
    icons: [
      { src: "/icons/rimebook-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/rimebook-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/rimebook-maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
      { src: "/icons/rimebook.svg", sizes: "any", type: "image/svg+xml", purpose: "any" },
    ],
  };
}
