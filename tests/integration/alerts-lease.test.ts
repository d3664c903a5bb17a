// The alert lease that elects one runner among several ingest workers: one holder at a time,
// renewable by its holder, taken over only once it has expired, keeping the cursor.
import { describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { acquireLease } from "../../ingest/alerts/elected";
import { useTestDatabase } from "./helpers/use-test-database";

const testDb = useTestDatabase({ label: "lease", seed: false });

describe("alert lease", () => {
  it("has one holder until it expires, then passes on with its cursor", async () => {
    const { orm } = testDb;
    const t0 = 1_767_225_600_000;
    expect(await acquireLease(orm, "alerts", "a", 3000, t0)).toBe(0); // no readings yet: from row 0
    expect(await acquireLease(orm, "alerts", "b", 3000, t0 + 1000)).toBeNull();
    expect(await acquireLease(orm, "alerts", "a", 3000, t0 + 2000)).toBe(0); // renewed until t0 + 5000
    await orm.run(sql`UPDATE leases SET cursor = 42 WHERE name = 'alerts'`);
    expect(await acquireLease(orm, "alerts", "b", 3000, t0 + 4000)).toBeNull();
    expect(await acquireLease(orm, "alerts", "b", 3000, t0 + 5001)).toBe(42);
    expect(await acquireLease(orm, "alerts", "a", 3000, t0 + 5002)).toBeNull();
  });
});
