// Certificate-table buffers as typed on screen and as sent to the API: the table must have at
// least two rows, temperatures strictly increasing within 0–60 °C, pH within 0–14.
import { describe, expect, it } from "vitest";
import { bufferPh, bufferTableProblem, bufferTableSchema, bufferTableToRows, readBufferTableRows } from "@/lib/calibration";

// A 7.00 technical buffer's table, typical maker values from memory (DOMAIN.md section 2).
const TECH_7 = [
  { tempC: "10", ph: "7.07" },
  { tempC: "20", ph: "7,02" },
  { tempC: "25", ph: "7.00" },
  { tempC: "30", ph: "6.99" },
];

describe("buffer table typed on screen", () => {
  it("reads rows (comma decimals too) into the { points } table bufferPh accepts", () => {
    const r = readBufferTableRows(TECH_7);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.table.points).toEqual([[10, 7.07], [20, 7.02], [25, 7.0], [30, 6.99]]);
    expect(JSON.parse(r.text)).toEqual({ points: [[10, 7.07], [20, 7.02], [25, 7], [30, 6.99]] });
    expect(bufferPh(r.table, 22.5)).toBeCloseTo(7.01, 6); // linear between 20 and 25 °C
    expect(bufferTableToRows(r.table)).toEqual([
      { tempC: "10", ph: "7.07" },
      { tempC: "20", ph: "7.02" },
      { tempC: "25", ph: "7" },
      { tempC: "30", ph: "6.99" },
    ]);
  });

  it("needs at least two rows", () => {
    const r = readBufferTableRows([{ tempC: "25", ph: "7.00" }]);
    expect(r).toMatchObject({ ok: false, fields: { _: "Enter at least 2 rows from the certificate" } });
  });

  it("names the field of each problem: empty, junk, out of range", () => {
    const r = readBufferTableRows([
      { tempC: "", ph: "7.0" },
      { tempC: "20", ph: "seven" },
      { tempC: "65", ph: "7.0" },
      { tempC: "70", ph: "14.5" },
    ]);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.fields).toMatchObject({
      "0.tempC": "Enter the temperature in °C",
      "1.ph": "Enter the pH",
      "2.tempC": "Between 0 and 60 °C",
      "3.ph": "Between pH 0 and 14; check the certificate",
    });
    expect(r.fields["3.tempC"]).toBe("Between 0 and 60 °C");
    // The message names the first problem in reading order, and how many more there are.
    expect(r.message).toBe("Row 1 of the buffer table: Enter the temperature in °C (and 4 more to fix)");
  });

  it("wants temperatures strictly increasing, row by row", () => {
    const twice = readBufferTableRows([{ tempC: "20", ph: "7.02" }, { tempC: "20", ph: "7.01" }]);
    expect(twice).toMatchObject({ ok: false, fields: { "1.tempC": "20 °C is listed twice; keep one row per temperature" } });
    const down = readBufferTableRows([{ tempC: "25", ph: "7.00" }, { tempC: "20", ph: "7.02" }, { tempC: "30", ph: "6.99" }]);
    expect(down).toMatchObject({ ok: false, fields: { "1.tempC": "Temperatures must go up row by row: 20 °C comes after 25 °C" } });
    expect(Object.keys(down.ok ? {} : down.fields)).toEqual(["1.tempC"]);
    expect(down.ok ? "" : down.message).toBe("Row 2 of the buffer table: Temperatures must go up row by row: 20 °C comes after 25 °C");
  });
});

describe("buffer table sent to the API", () => {
  it("accepts a valid table and says what is wrong with an invalid one, naming the row", () => {
    expect(bufferTableSchema.safeParse({ points: [[10, 4.0], [25, 4.01]] }).success).toBe(true);
    expect(bufferTableProblem({ points: [[10, 4.0], [25, 4.01]] })).toBeNull();
    expect(bufferTableProblem("tech-4.01")).toBeNull();
    expect(bufferTableProblem({ points: [[10, 4.0]] })).toBe("The buffer table: Enter at least 2 rows from the certificate");
    expect(bufferTableProblem({ points: [[10, 4.0], [5, 4.01]] })).toBe("Row 2 of the buffer table: Temperatures must go up row by row: 5 °C comes after 10 °C");
    expect(bufferTableProblem({ points: [[10, 4.0], [25, 15]] })).toBe("Row 2 of the buffer table: Between pH 0 and 14; check the certificate");
    expect(bufferTableProblem({ points: [[-1, 4.0], [25, 4]] })).toBe("Row 1 of the buffer table: Between 0 and 60 °C");
    expect(bufferTableProblem({ rows: [] })).toMatch(/^The buffer table: /);
  });
});
