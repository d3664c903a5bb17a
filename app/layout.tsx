import type { Metadata, Viewport } from "next";
import "./globals.css";
import { mono, sans } from "./fonts";
import { Providers } from "@/components/providers";
import { RegisterServiceWorker } from "@/components/pwa/register-service-worker";

export const metadata: Metadata = {
  title: { default: "Tidewell", template: "%s · Tidewell" },
  description: "Live tanks, probe calibration records and calibration-aware alerts for nutrient-solution growing.",
  appleWebApp: { capable: true, title: "Tidewell", statusBarStyle: "default" },
  icons: { apple: "/icons/icon-192.png" },
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#13524a" };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body>
        <Providers>{children}</Providers>
        <RegisterServiceWorker />
      </body>
    </html>
  );
}
