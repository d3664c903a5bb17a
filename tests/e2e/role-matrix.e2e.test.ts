/// <reference types="vite/client" />
// Every route handler under app/api, and every address the custom server answers itself
// (server/routes.ts), called as anonymous, each role and a user of another organisation. Routes
// are found on disk, so a new route that is not listed here (or not guarded) fails.
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, inject, it } from "vitest";
import type { Role } from "@/db/schema";
import { ROOT } from "./stack";
import { HttpSession, sessionFor } from "./session";
import { OTHER_ORG_USER } from "./fixtures";
import type { AccessTable } from "./access/roles";
import { CUSTOM_SERVER_ROUTES } from "@/server/routes";
import { openStackDb } from "./database";

// Each area of the product lists its routes in tests/e2e/access/<area>.ts.
const ALL: Role[] = ["owner", "grower", "night_manager"];
const ACCESS: AccessTable = Object.assign(
  {},
  ...Object.values(import.meta.glob<{ ACCESS: AccessTable }>(["./access/*.ts", "!./access/roles.ts"], { eager: true })).map((m) => m.ACCESS),
);

/** Which table a dynamic segment's sample id comes from, keyed by the segment before it. */
const SAMPLE_TABLE: Record<string, string> = {
  tanks: "tanks",
  incidents: "incidents",
  probes: "probes",
  holds: "holds",
  runs: "calibration_runs",
  users: "users",
  sites: "sites",
  devices: "devices",
  zones: "zones",
  "spot-checks": "spot_checks",
};

function findRoutes(dir = path.join(ROOT, "app/api")): { template: string; methods: string[] }[] {
  const out: { template: string; methods: string[] }[] = [];
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...findRoutes(full));
    else if (entry.name === "route.ts") {
      const src = fs.readFileSync(full, "utf8");
      const methods = new Set<string>();
      for (const m of src.matchAll(/export\s+(?:const|async function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]);
      for (const m of src.matchAll(/export\s+const\s+\{([^}]+)\}/g)) for (const name of m[1].split(",")) if (/^(GET|POST|PUT|PATCH|DELETE)$/.test(name.trim())) methods.add(name.trim());
      const template = "/" + path.relative(path.join(ROOT, "app"), path.dirname(full)).split(path.sep).join("/");
      out.push({ template, methods: [...methods] });
    }
  }
  return out;
}

const routes = [
  ...findRoutes().flatMap((r) => r.methods.map((method) => ({ method, template: r.template, key: `${method} ${r.template}` }))),
  ...CUSTOM_SERVER_ROUTES.map((r) => ({ method: r.method as string, template: r.template as string, key: `${r.method} ${r.template}` })),
];

describe("role matrix", () => {
  const baseURL = inject("baseURL");
  const sessions = new Map<string, HttpSession>();
  const sample = new Map<string, number>();

  beforeAll(async () => {
    for (const role of ALL) sessions.set(role, await sessionFor(baseURL, role));
    sessions.set("other-org", await new HttpSession(baseURL).signIn(OTHER_ORG_USER.email, OTHER_ORG_USER.password));
    sessions.set("anonymous", new HttpSession(baseURL));
    const db = openStackDb();
    const org = await db.execute("SELECT id FROM organisations ORDER BY id LIMIT 1");
    const orgId = Number(org.rows[0].id);
    for (const [segment, table] of Object.entries(SAMPLE_TABLE)) {
      const scoped =
        table === "users" || table === "sites" || table === "devices" || table === "incidents"
          ? `SELECT id FROM ${table} WHERE org_id = ${orgId} ORDER BY id LIMIT 1`
          : table === "tanks"
            ? `SELECT t.id FROM tanks t JOIN sites s ON s.id = t.site_id WHERE s.org_id = ${orgId} ORDER BY t.id LIMIT 1`
            : table === "spot_checks"
              ? `SELECT c.id FROM spot_checks c JOIN probes p ON p.id = c.probe_id JOIN tanks t ON t.id = p.tank_id JOIN sites s ON s.id = t.site_id WHERE s.org_id = ${orgId} ORDER BY c.id LIMIT 1`
              : `SELECT id FROM ${table} ORDER BY id LIMIT 1`;
      const r = await db.execute(scoped);
      if (r.rows[0]) sample.set(segment, Number(r.rows[0].id));
    }
    if (!sample.has("spot-checks")) {
      // The demo seeds no spot checks: one to edit and delete.
      const r = await db.execute(
        `INSERT INTO spot_checks (probe_id, taken_at, meter_value) SELECT p.id, ${Date.now()}, 6.0 FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN sites s ON s.id = t.site_id WHERE s.org_id = ${orgId} AND p.kind = 'ph' ORDER BY p.id LIMIT 1 RETURNING id`,
      );
      sample.set("spot-checks", Number(r.rows[0].id));
    }
    db.close();
  });

  function concrete(template: string) {
    const parts = template.split("/");
    return parts
      .map((p, i) => {
        if (!p.startsWith("[")) return p;
        if (p.startsWith("[...")) return "session";
        const id = sample.get(parts[i - 1]);
        if (id === undefined) throw new Error(`No sample id for ${template}: add its segment to SAMPLE_TABLE`);
        return String(id);
      })
      .join("/");
  }

  it("lists every route handler", () => {
    const unlisted = routes.filter((r) => !(r.key in ACCESS)).map((r) => r.key);
    expect(unlisted, "add these routes to a table in tests/e2e/access/").toEqual([]);
    expect(routes.length).toBeGreaterThan(3);
  });

  for (const route of routes) {
    const access = ACCESS[route.key];
    if (access === "public" || access === undefined) continue;
    it(`${route.key}`, async () => {
      const url = concrete(route.template);
      const init = route.method === "GET" ? {} : { method: route.method, headers: { "content-type": "application/json" }, body: "{}" };
      const anon = await sessions.get("anonymous")!.fetch(url, init);
      expect(anon.status, `anonymous ${route.key}`).toBe(401);
      for (const role of ALL) {
        const res = await sessions.get(role)!.fetch(url, init);
        if (access.includes(role)) expect([401, 403], `${role} ${route.key} → ${res.status}`).not.toContain(res.status);
        else expect(res.status, `${role} ${route.key}`).toBe(403);
        expect(res.status, `${role} ${route.key}`).toBeLessThan(500);
      }
      const other = await sessions.get("other-org")!.fetch(url, init);
      const text = await other.text();
      if (route.template.includes("[")) expect(other.status, `other organisation ${route.key}`).toBe(404);
      else expect(text, `other organisation sees none of this farm's data (${route.key})`).not.toMatch(/Larkspur|Butterhead|grower@larkspur/);
    });
  }
});
