// Every CSV export goes through one writer that defuses spreadsheet formulas (OWASP CSV injection).
import fs from "node:fs";
import path from "node:path";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { csvRows, csvTable } from "@/lib/settings/csv";

const ROOT = path.resolve(import.meta.dirname, "../..");

describe("CSV exports", () => {
  it("prefixes text cells that begin like a formula with a single quote", () => {
    const hostile = ["=HYPERLINK(\"http://evil.example\",\"open\")", "+SUM(A1:A9)", "-2+3", "@cmd", "\tTAB", "\rCR"];
    const csv = csvTable(["name"], hostile.map((h) => [h]));
    const cells = Papa.parse<string[]>(csv.trim()).data.slice(1).map((r) => r[0]);
    expect(cells).toEqual(hostile.map((h) => `'${h}`));
  });

  it("leaves ordinary text, numbers (negative ones too) and empty cells as they are", () => {
    const csv = csvTable(["a", "b", "c", "d"], [["L1 Butterhead", -0.5, null, "pH 5.8–6.2, a = b"], ["x", 0, undefined, "tank-1"]]);
    expect(csv).toBe('a,b,c,d\r\nL1 Butterhead,-0.5,,"pH 5.8–6.2, a = b"\r\nx,0,,tank-1\r\n');
    expect(csvRows([])).toBe("");
    expect(csvTable(["a", "b"], [])).toBe("a,b\r\n");
    expect(csvRows([["=1", -3]])).toBe("\"'=1\",-3\r\n");
  });

  it("is the only CSV writer in the app", () => {
    const offenders: string[] = [];
    const walk = (dir: string) => {
      for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
        const full = path.join(dir, e.name);
        if (e.isDirectory()) walk(full);
        else if (/\.tsx?$/.test(e.name) && /Papa\.unparse|unparse\(/.test(fs.readFileSync(full, "utf8"))) offenders.push(path.relative(ROOT, full));
      }
    };
    for (const dir of ["app", "db", "components", "ingest", "lib"]) walk(path.join(ROOT, dir));
    expect(offenders).toEqual(["lib/settings/csv.ts"]);
  });
});
