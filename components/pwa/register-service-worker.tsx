"use client";
import { useEffect } from "react";
import { usePathname } from "next/navigation";

/**
 * Registers public/sw.js (production builds only: in development it would keep stale bundles).
 * On the sign-in page the kept pages are forgotten: they hold the previous user's farm data.
 */
export function RegisterServiceWorker() {
  const pathname = usePathname();
  useEffect(() => {
    if (process.env.NODE_ENV !== "production" || !("serviceWorker" in navigator)) return;
    navigator.serviceWorker.register("/sw.js", { scope: "/" }).catch(() => undefined);
  }, []);
  useEffect(() => {
    if (pathname !== "/sign-in" || !("serviceWorker" in navigator)) return;
    navigator.serviceWorker.ready.then((r) => r.active?.postMessage({ type: "forget-pages" })).catch(() => undefined);
  }, [pathname]);
  return null;
}
