import { z } from "zod";
import { getDb } from "@/db/client";
import { importSpotChecksCsv } from "@/db/queries/spot-checks";
import { CAN_CHANGE, guarded } from "@/app/_server/guard";

/** Imports a CSV of handheld readings: all rows or, when any row is wrong, none. */
export const POST = guarded(
  { roles: CAN_CHANGE, action: "enter spot checks", maxBodyBytes: 2 * 1024 * 1024, body: z.object({ csv: z.string().min(1, "The file is empty").max(1_000_000, "The file is larger than 1 MB") }) },
  async ({ user, body }) => importSpotChecksCsv(getDb(), user, body.csv),
);
