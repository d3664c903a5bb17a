import NextAuth, { CredentialsSignin, type DefaultSession } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { z } from "zod";
import type { Role } from "@/db/schema";
import { requireSecret } from "@/ingest/secrets";
import { endSessions } from "./session-version";
import { claimsFromToken } from "./session-user";
import { checkPassword, clientAddress } from "./sign-in-throttle";

declare module "next-auth" {
  interface Session {
    user: { id: string; role: Role; orgId: number; sessionVersion: number } & DefaultSession["user"];
  }
  interface User {
    role?: Role;
    orgId?: number;
    sessionVersion?: number;
  }
}

/** Raised to the sign-in form; `code` is what the form shows. */
export class SignInRefused extends CredentialsSignin {
  constructor(code: string) {
    super(code);
    this.code = code;
  }
}

const credentialsSchema = z.object({
  email: z.email().transform((e) => e.toLowerCase()),
  password: z.string().min(1).max(200),
});

// Configured lazily, per request: the secret is read when a request arrives (the server refuses to
// start without it, see instrumentation.ts), never at build time and never from the source.
export const { handlers, auth, signIn, signOut } = NextAuth(() => ({
  trustHost: true,
  secret: requireSecret("AUTH_SECRET"),
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/sign-in" },
  providers: [
    Credentials({
      credentials: { email: { label: "E-mail" }, password: { label: "Password", type: "password" } },
      async authorize(raw, request) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) throw new SignInRefused("invalid-input");
        const result = await checkPassword(parsed.data.email, parsed.data.password, clientAddress(request?.headers));
        if (!result.ok) throw new SignInRefused(result.code);
        const u = result.user;
        return { id: String(u.id), email: u.email, name: u.name, role: u.role, orgId: u.orgId, sessionVersion: u.sessionVersion };
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.uid = user.id;
        token.role = user.role;
        token.orgId = user.orgId;
        token.sv = user.sessionVersion;
      }
      return token;
    },
    session({ session, token }) {
      const claims = claimsFromToken(token);
      session.user.id = claims.id;
      session.user.role = token.role as Role;
      session.user.orgId = Number(token.orgId);
      session.user.sessionVersion = claims.sessionVersion;
      return session;
    },
  },
  events: {
    // Signing out ends every session of the user at once, including copies of the cookie.
    async signOut(message) {
      const uid = "token" in message ? Number(message.token?.uid) : NaN;
      if (Number.isInteger(uid)) await endSessions(uid);
    },
  },
}));
