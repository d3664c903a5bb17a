// The enum values forms offer, kept here (not imported from db/schema) so client bundles stay free of
// the ORM; the `satisfies` checks below fail to compile if either side drifts.
import type { EcUnit, ProbeKind, Role } from "../../db/schema";

export const ROLES = ["owner", "grower", "night_manager"] as const satisfies readonly Role[];
export const EC_UNITS = ["mS/cm", "µS/cm", "ppm-500", "ppm-700", "CF"] as const satisfies readonly EcUnit[];
export const PROBE_KINDS = ["ph", "ec", "temp"] as const satisfies readonly ProbeKind[];

// Reverse checks: every value of the database enum is offered.
true satisfies Role extends (typeof ROLES)[number] ? true : never;
true satisfies EcUnit extends (typeof EC_UNITS)[number] ? true : never;
true satisfies ProbeKind extends (typeof PROBE_KINDS)[number] ? true : never;

export const ROLE_NAMES: Record<Role, string> = { owner: "Owner", grower: "Grower", night_manager: "Night manager" };
export { MEASURE_NAME as PROBE_KIND_NAMES } from "../display/labels";
