import type { Metadata } from "next";
import Link from "next/link";
import { Logo } from "@/components/logo";
import { ReloadButton } from "@/components/pwa/reload-button";

export const metadata: Metadata = { title: "Offline" };

/** Shown by the service worker for a page this device has not kept, while there is no connection. */
export default function OfflinePage() {
  return (
    <main className="flex min-h-dvh items-center justify-center p-6">
      <div className="w-full max-w-md space-y-4">
        <Logo />
        <h1 className="text-2xl font-semibold">No connection</h1>
        <p className="text-ink-soft">
          This page is not kept on this device. The tank wall, tank pages and calibration runs you opened recently are: open them from the links below. A calibration point you
          captured is kept on the device and sent when the connection returns.
        </p>
        <ul className="space-y-2">
          <li>
            <Link href="/" className="flex h-12 items-center rounded-md border border-paper-line bg-paper-raised px-4 font-medium hover:bg-paper-sunk">
              Tank wall
            </Link>
          </li>
          <li>
            <Link href="/tanks" className="flex h-12 items-center rounded-md border border-paper-line bg-paper-raised px-4 font-medium hover:bg-paper-sunk">
              Tanks
            </Link>
          </li>
        </ul>
        <ReloadButton />
        <p className="text-sm text-ink-soft">Alerts keep running on the server while this device is offline; they are an aid, not a substitute for walking the tanks.</p>
      </div>
    </main>
  );
}
