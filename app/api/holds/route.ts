import { z } from "zod";
import { getDb } from "@/db/client";
import { DEFAULT_HOLD_MINUTES, placeHold } from "@/db/queries/holds";
import { CAN_CHANGE, guarded } from "@/app/_server/guard";
import { sendDosing } from "./dosing";

const placeBody = z.object({
  tankId: z.number().int().positive(),
  probeId: z.number().int().positive().nullish(),
  reason: z.string().trim().min(1, "Say why the tank is held").max(300),
  minutes: z.number().int().min(1).max(24 * 60).default(DEFAULT_HOLD_MINUTES),
});

/** Places a hold on a tank (or one probe) and sends the dosing inhibit to its controller. */
export const POST = guarded({ roles: CAN_CHANGE, action: "place holds", body: placeBody, status: 201 }, async ({ user, body }) => {
  const now = Date.now();
  const { hold, tank } = await placeHold(getDb(), user, body, now);
  const dosing = await sendDosing("inhibit", hold, tank, now);
  return { hold, dosing };
});
