import { ROLES, ROLE_NAMES } from "@/lib/settings/enums";

export const ROLE_OPTIONS = ROLES.map((r) => ({ value: r, label: ROLE_NAMES[r] }));
