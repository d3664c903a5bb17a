// The settings tests add sites, tanks and probes to the demo farm; afterwards they are removed with
// everything that hangs on them, so other tests still see the seeded eight tanks.
import type { Client } from "@libsql/client";

const TANKS = "SELECT id FROM tanks WHERE site_id = ?1";
const PROBES = `SELECT id FROM probes WHERE tank_id IN (${TANKS})`;
const INCIDENTS = `SELECT id FROM incidents WHERE tank_id IN (${TANKS})`;

const STATEMENTS = [
  `DELETE FROM incident_events WHERE incident_id IN (${INCIDENTS})`,
  `DELETE FROM notifications WHERE incident_id IN (${INCIDENTS})`,
  `DELETE FROM incidents WHERE tank_id IN (${TANKS})`,
  `DELETE FROM calibration_points WHERE run_id IN (SELECT id FROM calibration_runs WHERE tank_id IN (${TANKS}))`,
  `DELETE FROM calibration_runs WHERE tank_id IN (${TANKS})`,
  `DELETE FROM spot_checks WHERE probe_id IN (${PROBES})`,
  `DELETE FROM holds WHERE tank_id IN (${TANKS})`,
  `DELETE FROM readings WHERE probe_id IN (${PROBES})`,
  `DELETE FROM rollups WHERE probe_id IN (${PROBES})`,
  `DELETE FROM rollups_hourly WHERE probe_id IN (${PROBES})`,
  `DELETE FROM alert_state WHERE key IN (SELECT 'probe:' || id FROM probes WHERE tank_id IN (${TANKS})) OR key IN (SELECT 'tank:' || id FROM tanks WHERE site_id = ?1)`,
  `DELETE FROM alert_rules WHERE tank_id IN (${TANKS})`,
  `DELETE FROM devices WHERE tank_id IN (${TANKS})`,
  `DELETE FROM probes WHERE tank_id IN (${TANKS})`,
  "DELETE FROM tanks WHERE site_id = ?1",
  "DELETE FROM zones WHERE site_id = ?1",
  "DELETE FROM sites WHERE id = ?1",
];

export async function removeSite(db: Client, siteId: number): Promise<void> {
  await db.batch(
    STATEMENTS.map((sql) => ({ sql, args: [siteId] })),
    "write",
  );
}
