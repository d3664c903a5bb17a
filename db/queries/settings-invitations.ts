// Invitations: a signed, expiring, single-use link (HS256 with AUTH_SECRET; the jti is recorded in
// used_tokens on acceptance) mailed to the invitee, who sets their own password on /invite/[token].
import { randomUUID } from "node:crypto";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { SignJWT, errors as joseErrors, jwtVerify } from "jose";
import type { Db } from "../client";
import { notifications, organisations, usedTokens, users } from "../schema";
import { ApiError } from "../../app/_server/errors";
import { appUrl, sendMail } from "../../ingest/mailer";
import { requireSecret } from "../../ingest/secrets";
import { ROLE_NAMES } from "../../lib/settings/enums";
import { audit } from "./audit";

export const INVITATION_TTL_MS = 72 * 3_600_000;
const PURPOSE = "invite";

function secret() {
  return new TextEncoder().encode(requireSecret("AUTH_SECRET"));
}

export async function signInvitation(userId: number, now = Date.now()): Promise<string> {
  return new SignJWT({ purpose: PURPOSE })
    .setProtectedHeader({ alg: "HS256" })
    .setSubject(String(userId))
    .setJti(randomUUID())
    .setIssuedAt(Math.floor(now / 1000))
    .setExpirationTime(Math.floor((now + INVITATION_TTL_MS) / 1000))
    .sign(secret());
}

const invalidLink = (message: string) => new ApiError(422, "invitation_invalid", message);

/** The invitation's user and token id, or an error the invite page shows as it is. */
export async function readInvitation(db: Db, token: string) {
  let payload;
  try {
    ({ payload } = await jwtVerify(token, secret(), { algorithms: ["HS256"] }));
  } catch (err) {
    if (err instanceof joseErrors.JWTExpired) throw invalidLink("This invitation has expired. Ask your farm's owner to send a new one.");
    throw invalidLink("This invitation link is not valid. Check that you opened the whole link from the e-mail.");
  }
  if (payload.purpose !== PURPOSE || !payload.jti || !payload.sub) throw invalidLink("This invitation link is not valid.");
  const used = await db.query.usedTokens.findFirst({ where: eq(usedTokens.jti, payload.jti) });
  if (used) throw invalidLink("This invitation has already been used. Sign in with the password you chose.");
  const user = await db.query.users.findFirst({ where: eq(users.id, Number(payload.sub)) });
  if (!user || !user.active) throw invalidLink("This invitation has been withdrawn. Ask your farm's owner.");
  if (user.passwordHash !== null) throw invalidLink("This account is already set up. Sign in with your password.");
  const org = await db.query.organisations.findFirst({ where: eq(organisations.id, user.orgId) });
  return { user, jti: payload.jti, orgName: org?.name ?? "" };
}

/** Sets the invitee's password and spends the link, in one transaction. */
export async function acceptInvitation(db: Db, token: string, password: string, now = Date.now()) {
  const { user, jti } = await readInvitation(db, token);
  const passwordHash = await bcrypt.hash(password, 10);
  await db.transaction(async (tx) => {
    await tx.insert(usedTokens).values({ jti, usedAt: now }); // primary key: a second use fails here
    await tx.update(users).set({ passwordHash }).where(eq(users.id, user.id));
    await audit(tx, { orgId: user.orgId, userId: user.id, at: now, action: "user.accept_invitation", entity: "user", entityId: user.id, detail: { email: user.email } });
  });
  return { email: user.email };
}

/** Mails the invitation link and records the attempt; resolves with whether the mail went out. */
export async function mailInvitation(db: Db, invitee: typeof users.$inferSelect, invitedBy: string, now = Date.now()) {
  const org = await db.query.organisations.findFirst({ where: eq(organisations.id, invitee.orgId) });
  const link = `${appUrl()}/invite/${await signInvitation(invitee.id, now)}`;
  const subject = `[Tidewell] ${invitedBy} invited you to ${org?.name ?? "their farm"}`;
  const text = [
    `Hello ${invitee.name},`,
    "",
    `${invitedBy} has invited you to Tidewell for ${org?.name ?? "their farm"} as ${ROLE_NAMES[invitee.role].toLowerCase()}.`,
    "Open this link to choose your password (it works once, for 72 hours):",
    "",
    link,
    "",
    "If you did not expect this, ignore this e-mail.",
  ].join("\n");
  let error: string | null = null;
  try {
    await sendMail({ to: invitee.email, subject, text });
  } catch (err) {
    error = err instanceof Error ? err.message : String(err);
  }
  await db.insert(notifications).values({ orgId: invitee.orgId, userId: invitee.id, kind: "invitation", toAddress: invitee.email, subject, status: error ? "failed" : "sent", error, sentAt: now });
  return { mailed: error === null };
}

/** Tells the holder of an address that another organisation tried to invite it; nothing changes. */
export async function mailInvitedElsewhere(db: Db, holder: typeof users.$inferSelect, inviter: { orgId: number; name: string }): Promise<boolean> {
  const org = await db.query.organisations.findFirst({ where: eq(organisations.id, inviter.orgId) });
  const text = [
    `Hello ${holder.name},`,
    "",
    `${inviter.name} of ${org?.name ?? "another farm"} tried to invite this address to Tidewell. It already has an account with another organisation, so nothing was changed.`,
    "If you want to join them, ask them to invite another address of yours. If you did not expect this, ignore this e-mail.",
  ].join("\n");
  try {
    await sendMail({ to: holder.email, subject: `[Tidewell] ${inviter.name} tried to invite you to ${org?.name ?? "their farm"}`, text });
    return true;
  } catch {
    return false;
  }
}
