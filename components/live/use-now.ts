"use client";
import { useEffect, useState } from "react";

/** The current time, ticking; starts at the server render's time so hydration matches. */
export function useNow(initial: number, everyMs = 5_000): number {
  const [now, setNow] = useState(initial);
  useEffect(() => {
    const id = setInterval(() => setNow(Date.now()), everyMs);
    return () => clearInterval(id);
  }, [everyMs]);
  return now;
}
