// Signs in over HTTP exactly as the browser does (CSRF token, credentials callback) and keeps the cookies.
import { DEMO_PASSWORD, DEMO_USERS } from "@/db/seed/scenario";
import type { Role } from "@/db/schema";

export class HttpSession {
  private cookies = new Map<string, string>();
  constructor(private baseURL: string) {}

  private store(res: Response) {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(";");
      const i = pair.indexOf("=");
      this.cookies.set(pair.slice(0, i), pair.slice(i + 1));
    }
  }

  cookieHeader() {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  async fetch(pathname: string, init: RequestInit = {}) {
    const res = await fetch(this.baseURL + pathname, { ...init, redirect: "manual", headers: { ...(init.headers ?? {}), cookie: this.cookieHeader() } });
    this.store(res);
    return res;
  }

  async signIn(email: string, password: string) {
    const csrf = await this.fetch("/api/auth/csrf");
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const res = await this.fetch("/api/auth/callback/credentials", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ email, password, csrfToken }),
    });
    if (![...this.cookies.keys()].some((k) => k.includes("session-token"))) throw new Error(`sign-in failed for ${email}: ${res.status} ${res.headers.get("location")}`);
    return this;
  }
}

export function demoEmail(role: Role) {
  return DEMO_USERS.find((u) => u.role === role)!.email;
}

export async function sessionFor(baseURL: string, role: Role) {
  return new HttpSession(baseURL).signIn(demoEmail(role), DEMO_PASSWORD);
}
