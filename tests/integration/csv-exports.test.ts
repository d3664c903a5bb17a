// The owner's exports against a seeded farm whose names and notes were typed by someone hostile:
// every such cell opens in a spreadsheet as text, never as a formula.
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { calibrationsCsv, readingsCsv } from "@/db/queries/settings-exports";
import { useTestDatabase } from "./helpers/use-test-database";

const testDb = useTestDatabase({ label: "csv", per: "file" });
let orgId: number;
let tankId: number;

beforeAll(async () => {
  const { client } = testDb;
  const tank = await client.execute("SELECT t.id, s.org_id FROM tanks t JOIN sites s ON s.id = t.site_id JOIN calibration_runs r ON r.tank_id = t.id ORDER BY t.id LIMIT 1");
  tankId = Number(tank.rows[0].id);
  orgId = Number(tank.rows[0].org_id);
  await client.execute({ sql: "UPDATE tanks SET name = ? WHERE id = ?", args: ["=HYPERLINK(\"http://evil.example\",\"L1\")", tankId] });
  await client.execute({ sql: "UPDATE calibration_runs SET note = ? WHERE tank_id = ?", args: ["@SUM(1+1)*cmd|' /C calc'!A0", tankId] });
});

const parse = (csv: string) => Papa.parse<Record<string, string>>(csv.trim(), { header: true }).data;

describe("CSV exports", () => {
  it("the calibration export writes hostile names and notes as text", async () => {
    const rows = parse(await calibrationsCsv(testDb.orm, orgId, { from: 0, to: Date.now() + 86_400_000 })).filter((r) => r.tank.includes("HYPERLINK"));
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) {
      expect(r.tank).toBe("'=HYPERLINK(\"http://evil.example\",\"L1\")");
      expect(r.note).toBe("'@SUM(1+1)*cmd|' /C calc'!A0");
    }
    // Negative numbers stay numbers.
    const offsets = rows.map((r) => r.offset_mv).filter((v) => v !== "");
    for (const v of offsets) expect(v).toMatch(/^-?\d/);
  });

  it("the readings export keeps numbers numeric", async () => {
    const { stream } = await readingsCsv(testDb.orm, orgId, { tank: tankId, from: testDb.db.seedNow - 3_600_000, to: testDb.db.seedNow });
    const text = await new Response(stream).text();
    const rows = parse(text);
    expect(rows.length).toBeGreaterThan(10);
    expect(text).not.toContain("\r\n\r\n");
    for (const r of rows) expect(r.raw).toMatch(/^-?\d/);
  });
});
