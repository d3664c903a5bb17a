"use client";
// The signed-in user's role, fetched once and shared by every tile (the server checks it again).
import { useQuery } from "@tanstack/react-query";
import type { Role } from "@/db/schema";

export function useMyRole(): Role | null {
  const { data } = useQuery({
    queryKey: ["me"],
    queryFn: async () => {
      const res = await fetch("/api/me");
      if (!res.ok) return null;
      return ((await res.json()) as { user: { role: Role } }).user;
    },
    staleTime: 5 * 60_000,
  });
  return data?.role ?? null;
}
