// The tank series reads the resolution its range calls for: minute rollups up to two weeks,
// hourly rollups beyond (30 days and a year), and the same readings whichever it reads.
import { describe, expect, it } from "vitest";
import { loadTankSeries } from "../../app/api/tanks/[id]/series/load-series";
import { useTestDatabase } from "./helpers/use-test-database";

const DAY = 86_400_000;
const testDb = useTestDatabase({ label: "series", per: "file" });

async function phProbeOfFirstTank() {
  const rs = await testDb.client.execute("SELECT p.id, p.tank_id, s.org_id FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN sites s ON s.id = t.site_id WHERE p.kind = 'ph' ORDER BY p.id LIMIT 1");
  return { probeId: Number(rs.rows[0].id), tankId: Number(rs.rows[0].tank_id), orgId: Number(rs.rows[0].org_id) };
}

describe("tank series resolutions", () => {
  it("30 days and a year read hourly rollups, a week minute ones, and all count the same readings", async () => {
    const { db, client, orm } = testDb;
    const { probeId, tankId, orgId } = await phProbeOfFirstTank();
    const to = db.seedNow + 60_000;
    const valuedSince = async (from: number) =>
      Number((await client.execute({ sql: "SELECT count(value) AS n FROM readings WHERE probe_id = ? AND ts >= ? AND ts < ?", args: [probeId, from, to] })).rows[0].n);
    const total = (counts: number[]) => counts.reduce((a, b) => a + b, 0);

    const month = await loadTankSeries(orm, orgId, tankId, to - 30 * DAY, to, 2000);
    expect(month?.source).toBe("hourly-rollups");
    expect(month!.bucketMs).toBeGreaterThanOrEqual(3_600_000);
    expect(month!.series.ph.t.length).toBeLessThanOrEqual(721);
    // Buckets are aligned to the hour: every reading of the range's first bucket on is counted.
    expect(total(month!.series.ph.count)).toBe(await valuedSince(month!.series.ph.t[0]));

    const year = await loadTankSeries(orm, orgId, tankId, to - 365 * DAY, to, 2000);
    expect(year?.source).toBe("hourly-rollups");
    expect(year!.series.ph.t.length).toBeLessThanOrEqual(2000);
    expect(total(year!.series.ph.count)).toBe(await valuedSince(to - 365 * DAY));

    const week = await loadTankSeries(orm, orgId, tankId, to - 7 * DAY, to, 2000);
    expect(week?.source).toBe("rollups");
    expect(total(week!.series.ph.count)).toBe(await valuedSince(week!.series.ph.t[0]));

    // The seed filled the hourly rollups from its minute ones.
    const disagree = await client.execute(`SELECT count(*) AS n FROM rollups_hourly h JOIN (
        SELECT probe_id, (minute / 3600000) * 3600000 AS hour, sum(count) AS n FROM rollups GROUP BY 1, 2) m
        ON m.probe_id = h.probe_id AND m.hour = h.hour WHERE m.n != h.count`);
    expect(Number(disagree.rows[0].n)).toBe(0);
  });
});
