import type { Metadata, Viewport } from "next";
import "./globals.css";
import { mono, sans } from "./fonts";
import { Providers } from "@/components/providers";

export const metadata: Metadata = {
  title: { default: "Tidewell", template: "%s · Tidewell" },
  description: "Live tanks, probe calibration records and calibration-aware alerts for nutrient-solution growing.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#13524a" };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body>
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
