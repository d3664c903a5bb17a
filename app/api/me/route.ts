import { ALL_ROLES, guarded } from "@/app/_server/guard";

export const GET = guarded({ roles: ALL_ROLES }, async ({ user }) => ({ user }));
