// Who may call what, as the guard (guard.ts) and the custom server's lean handlers check it.
import type { Role } from "@/db/schema";

export const ALL_ROLES = ["owner", "grower", "night_manager"] as const satisfies readonly Role[];
export const CAN_CHANGE = ["owner", "grower"] as const satisfies readonly Role[];
export const OWNER_ONLY = ["owner"] as const satisfies readonly Role[];
