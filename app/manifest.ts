import type { MetadataRoute } from "next";

/**
 * The bench PC installs Counterpoise as a web app (served at /manifest.webmanifest): it opens
 * on the bench board in its own window. The icons are our own drawing (scripts/make-icons.ts).
 */
export default function manifest(): MetadataRoute.Manifest {
  return {
    id: "/board",
    name: "Counterpoise balancing workbench",
    short_name: "Counterpoise",
    description: "Weigh, match and balance rotating assemblies at the bench.",
    start_url: "/board",
    scope: "/",
    display: "standalone",
    orientation: "any",
    background_color: "#262a31",
    theme_color: "#262a31",
    icons: [
      { src: "/icons/icon.svg", sizes: "any", type: "image/svg+xml", purpose: "any" },
      { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/maskable-192.png", sizes: "192x192", type: "image/png", purpose: "maskable" },
      { src: "/icons/maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
    ],
  };
}
