import type { Role } from "@/db/schema";

export const ALL: Role[] = ["owner", "grower", "night_manager"];
export const CHANGERS: Role[] = ["owner", "grower"];
export const OWNER: Role[] = ["owner"];

/** "METHOD /api/path/[param]" → who may call it; "public" for sign-in machinery and signed links. */
export type AccessTable = Record<string, Role[] | "public">;
