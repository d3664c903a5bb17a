// Who is on the other end of a broker connection, once authenticated.
import type { ServiceAccount } from "../topics";

export type Principal =
  | { kind: "service"; account: ServiceAccount; username: string }
  | { kind: "device"; username: string; controllerId: string; deviceId: number };

export function describePrincipal(p: Principal): string {
  return p.kind === "service" ? `service ${p.username}` : `device ${p.username} (controller ${p.controllerId})`;
}
