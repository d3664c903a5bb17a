import type { MetadataRoute } from "next";

/** Lets a phone install Tidewell to its home screen (with public/sw.js, it opens offline too). */
export default function manifest(): MetadataRoute.Manifest {
  return {
    name: "Tidewell",
    short_name: "Tidewell",
    description: "Live tanks, probe calibration records and calibration-aware alerts for nutrient-solution growing.",
    start_url: "/",
    scope: "/",
    display: "standalone",
    orientation: "any",
    background_color: "#f6f5f2",
    theme_color: "#13524a",
    icons: [
      { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
    ],
  };
}
