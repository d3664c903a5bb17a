// Signed "acknowledge from the mail" links: HS256 with AUTH_SECRET, 24 h expiry, single use
// (the jti is recorded in used_tokens when the link is confirmed).
import { randomUUID } from "node:crypto";
import { jwtVerify, SignJWT } from "jose";
import { z } from "zod";
import { appUrl } from "../mailer";
import { requireSecret } from "../secrets";

export const ACK_LINK_TTL_MS = 24 * 60 * 60_000;
const PURPOSE = "incident-ack";

function secret() {
  return new TextEncoder().encode(requireSecret("AUTH_SECRET"));
}

const claims = z.object({
  purpose: z.literal(PURPOSE),
  sub: z.string().regex(/^\d+$/),
  inc: z.number().int().positive(),
  jti: z.string().min(8),
  exp: z.number().int(),
});

export interface AckClaims {
  userId: number;
  incidentId: number;
  jti: string;
  expiresAt: number;
}

export async function signAckToken(o: { userId: number; incidentId: number; now: number }): Promise<string> {
  const iat = Math.floor(o.now / 1000);
  return new SignJWT({ purpose: PURPOSE, inc: o.incidentId })
    .setProtectedHeader({ alg: "HS256" })
    .setSubject(String(o.userId))
    .setJti(randomUUID())
    .setIssuedAt(iat)
    .setExpirationTime(iat + ACK_LINK_TTL_MS / 1000)
    .sign(secret());
}

export function ackUrl(token: string): string {
  return `${appUrl()}/ack/${token}`;
}

/** The link's claims, or why it cannot be used ("expired" or "invalid"). */
export async function verifyAckToken(token: string, now = Date.now()): Promise<{ ok: true; claims: AckClaims } | { ok: false; reason: "expired" | "invalid" }> {
  try {
    const { payload } = await jwtVerify(token, secret(), { algorithms: ["HS256"], currentDate: new Date(now) });
    const c = claims.safeParse(payload);
    if (!c.success) return { ok: false, reason: "invalid" };
    return { ok: true, claims: { userId: Number(c.data.sub), incidentId: c.data.inc, jti: c.data.jti, expiresAt: c.data.exp * 1000 } };
  } catch (err) {
    return { ok: false, reason: (err as { code?: string }).code === "ERR_JWT_EXPIRED" ? "expired" : "invalid" };
  }
}
