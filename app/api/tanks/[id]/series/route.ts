import { z } from "zod";
import { getDb } from "@/db/client";
import { notFound } from "@/app/_server/errors";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";
import { loadTankSeries } from "./load-series";

/** Longest range one request may ask for: a year (leap or not); hourly rollups make it cheap. */
const MAX_RANGE_MS = 366 * 86_400_000;

const seriesQuery = z
  .object({
    from: z.coerce.number().int().positive().optional(),
    to: z.coerce.number().int().positive().optional(),
    points: z.coerce.number().int().min(10).max(5000).default(1000),
  })
  .transform((q) => {
    const to = q.to ?? Date.now();
    return { to, from: q.from ?? to - 3_600_000, points: q.points };
  })
  .refine((q) => q.to > q.from, { message: "The range must end after it starts.", path: ["to"] })
  .refine((q) => q.to - q.from <= MAX_RANGE_MS, { message: "The range may be at most 366 days.", path: ["from"] });

export const dynamic = "force-dynamic";

export const GET = guarded({ roles: ALL_ROLES, params: idParam, query: seriesQuery }, async ({ user, params, query }) => {
  const series = await loadTankSeries(getDb(), user.orgId, params.id, query.from, query.to, query.points);
  if (!series) throw notFound("That tank");
  return series;
});
