// The one Drizzle schema for Tidewell. Times are integer milliseconds since the epoch
// (UTC) throughout, so the ingest hot path never converts Date objects.
import { relations, sql } from "drizzle-orm";
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";

export const ROLES = ["owner", "grower", "night_manager"] as const;
export type Role = (typeof ROLES)[number];
export const PROBE_KINDS = ["ph", "ec", "temp"] as const;
export type ProbeKind = (typeof PROBE_KINDS)[number];
export const QUALITY_FLAGS = ["ok", "held", "uncalibrated", "lapsed", "suspect"] as const;
export type QualityFlag = (typeof QUALITY_FLAGS)[number];
export const EC_UNITS = ["mS/cm", "µS/cm", "ppm-500", "ppm-700", "CF"] as const;
export type EcUnit = (typeof EC_UNITS)[number];
export const INCIDENT_STATES = ["open", "acknowledged", "resolved"] as const;
export type IncidentState = (typeof INCIDENT_STATES)[number];

const id = () => integer("id").primaryKey({ autoIncrement: true });
const createdAt = () =>
  integer("created_at")
    .notNull()
    .default(sql`(unixepoch() * 1000)`);

export const organisations = sqliteTable("organisations", {
  id: id(),
  name: text("name").notNull(),
  createdAt: createdAt(),
});

export const users = sqliteTable(
  "users",
  {
    id: id(),
    orgId: integer("org_id")
      .notNull()
      .references(() => organisations.id),
    email: text("email").notNull(),
    name: text("name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    passwordHash: text("password_hash"),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    ecUnit: text("ec_unit", { enum: EC_UNITS }).notNull().default("mS/cm"),
    wallSound: integer("wall_sound", { mode: "boolean" }).notNull().default(false),
    notifyEmail: integer("notify_email", { mode: "boolean" }).notNull().default(true),
    // Carried in the session cookie and checked on every request; signing out bumps it, so a
    // copied cookie stops working at once rather than when it expires.
    sessionVersion: integer("session_version").notNull().default(0),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("users_email_unique").on(t.email)],
);

export const sites = sqliteTable("sites", {
  id: id(),
  orgId: integer("org_id")
    .notNull()
    .references(() => organisations.id),
  name: text("name").notNull(),
  timeZone: text("time_zone").notNull().default("UTC"),
  // Shift hours in the site's local time; the day shift runs [dayStartHour, nightStartHour).
  dayStartHour: integer("day_start_hour").notNull().default(7),
  nightStartHour: integer("night_start_hour").notNull().default(19),
  dayRole: text("day_role", { enum: ROLES }).notNull().default("grower"),
  nightRole: text("night_role", { enum: ROLES }).notNull().default("night_manager"),
  escalateAfterMinutes: integer("escalate_after_minutes").notNull().default(15),
  maxCalibrationIntervalDays: integer("max_calibration_interval_days").notNull().default(30),
  maxHoldMinutes: integer("max_hold_minutes").notNull().default(240),
  createdAt: createdAt(),
});

export const zones = sqliteTable("zones", {
  id: id(),
  siteId: integer("site_id")
    .notNull()
    .references(() => sites.id),
  name: text("name").notNull(),
});

export const tanks = sqliteTable(
  "tanks",
  {
    id: id(),
    siteId: integer("site_id")
      .notNull()
      .references(() => sites.id),
    zoneId: integer("zone_id").references(() => zones.id),
    name: text("name").notNull(),
    crop: text("crop").notNull(),
    phMin: real("ph_min").notNull(),
    phMax: real("ph_max").notNull(),
    // Conductivity is kept in µS/cm everywhere in storage; the UI converts for display.
    ecMinUs: real("ec_min_us").notNull(),
    ecMaxUs: real("ec_max_us").notNull(),
    tempMin: real("temp_min").notNull().default(18),
    tempMax: real("temp_max").notNull().default(22),
    ecAlphaPerC: real("ec_alpha_per_c").notNull().default(0.019),
    spotCheckTolerancePh: real("spot_check_tolerance_ph").notNull().default(0.1),
    spotCheckToleranceEcUs: real("spot_check_tolerance_ec_us").notNull().default(100),
    calibrationIntervalDays: integer("calibration_interval_days").notNull().default(30),
    controllerId: text("controller_id"),
    createdAt: createdAt(),
  },
  (t) => [index("tanks_site_idx").on(t.siteId), uniqueIndex("tanks_controller_unique").on(t.controllerId)],
);

// A tank controller that publishes raw signals over MQTT with its own credentials.
export const devices = sqliteTable(
  "devices",
  {
    id: id(),
    orgId: integer("org_id")
      .notNull()
      .references(() => organisations.id),
    tankId: integer("tank_id").references(() => tanks.id),
    controllerId: text("controller_id").notNull(),
    username: text("username").notNull(),
    secretHash: text("secret_hash").notNull(),
    revokedAt: integer("revoked_at"),
    lastSeenAt: integer("last_seen_at"),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("devices_username_unique").on(t.username),
    index("devices_controller_idx").on(t.controllerId),
    // A controller id names one live device across every organisation: it is the device's MQTT
    // client id and topic level, so two live devices sharing one could take over each other.
    uniqueIndex("devices_live_controller_unique")
      .on(t.controllerId)
      .where(sql`${t.revokedAt} IS NULL`),
  ],
);

export const PROBE_STATUSES = ["active", "replace", "retired"] as const;
export const probes = sqliteTable(
  "probes",
  {
    id: id(),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id),
    kind: text("kind", { enum: PROBE_KINDS }).notNull(),
    serial: text("serial").notNull(),
    nominalCellConstant: real("nominal_cell_constant"), // 1/cm, EC probes only
    installedAt: integer("installed_at").notNull(),
    retiredAt: integer("retired_at"),
    status: text("status", { enum: PROBE_STATUSES }).notNull().default("active"),
    replacedById: integer("replaced_by_id"),
  },
  (t) => [index("probes_tank_idx").on(t.tankId), uniqueIndex("probes_serial_unique").on(t.serial)],
);

export const RUN_STATUSES = ["in_progress", "accepted", "rejected", "abandoned"] as const;
export const calibrationRuns = sqliteTable(
  "calibration_runs",
  {
    id: id(),
    probeId: integer("probe_id")
      .notNull()
      .references(() => probes.id),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id),
    source: text("source", { enum: ["guided", "manual"] }).notNull(),
    status: text("status", { enum: RUN_STATUSES }).notNull(),
    startedBy: integer("started_by").references(() => users.id),
    startedAt: integer("started_at").notNull(),
    completedAt: integer("completed_at"),
    // The instant from which ingest corrects readings with this calibration.
    effectiveAt: integer("effective_at"),
    slopePct: real("slope_pct"),
    offsetMv: real("offset_mv"),
    cellConstant: real("cell_constant"),
    deviationPct: real("deviation_pct"),
    reasons: text("reasons", { mode: "json" }).$type<string[]>().notNull().default([]),
    asFoundErrorPh: real("as_found_error_ph"),
    asFoundErrorPct: real("as_found_error_pct"),
    holdId: integer("hold_id"),
    uploadId: integer("upload_id"),
    note: text("note"),
    // Guided runs: the buffers or standards chosen at the start, in order (ids or JSON tables),
    // and the steps confirmed so far, so a closed browser reloads into the right step.
    plannedStandards: text("planned_standards", { mode: "json" }).$type<string[]>().notNull().default([]),
    cleanedAt: integer("cleaned_at"),
    asFoundSkipped: integer("as_found_skipped", { mode: "boolean" }).notNull().default(false),
  },
  (t) => [index("runs_probe_effective_idx").on(t.probeId, t.effectiveAt), index("runs_tank_idx").on(t.tankId)],
);

export const calibrationPoints = sqliteTable(
  "calibration_points",
  {
    id: id(),
    runId: integer("run_id")
      .notNull()
      .references(() => calibrationRuns.id),
    seq: integer("seq").notNull(),
    purpose: text("purpose", { enum: ["as_found", "point"] }).notNull(),
    // A buffer id from lib/calibration, or a user table as JSON.
    standard: text("standard").notNull(),
    lot: text("lot"),
    expiresOn: text("expires_on"), // YYYY-MM-DD
    mv: real("mv"),
    conductanceUs: real("conductance_us"),
    tempC: real("temp_c").notNull(),
    tempSource: text("temp_source", { enum: ["probe", "typed"] }).notNull().default("probe"),
    expected: real("expected"), // buffer pH or standard µS/cm at tempC
    capturedAt: integer("captured_at").notNull(),
    stable: integer("stable", { mode: "boolean" }).notNull().default(true),
    note: text("note"),
    // A key the capturing device makes up, so a point sent again after a dropped connection is saved once.
    clientKey: text("client_key"),
  },
  (t) => [index("points_run_idx").on(t.runId), uniqueIndex("points_run_client_key_unique").on(t.runId, t.clientKey)],
);

// Raw signal and corrected value for every probe sample; the hot table.
export const readings = sqliteTable(
  "readings",
  {
    probeId: integer("probe_id").notNull(),
    ts: integer("ts").notNull(),
    raw: real("raw").notNull(),
    value: real("value"), // pH, µS/cm at 25 °C, or °C
    quality: text("quality", { enum: QUALITY_FLAGS }).notNull(),
    calibrationRunId: integer("calibration_run_id"),
  },
  (t) => [primaryKey({ columns: [t.probeId, t.ts] })],
);

export const rollups = sqliteTable(
  "rollups",
  {
    probeId: integer("probe_id").notNull(),
    minute: integer("minute").notNull(), // ms epoch of the minute start
    min: real("min").notNull(),
    max: real("max").notNull(),
    sum: real("sum").notNull(),
    count: integer("count").notNull(),
  },
  (t) => [primaryKey({ columns: [t.probeId, t.minute] })],
);

// The same summaries per hour, kept with the minute ones (by the ingest and recomputeFrom), so
// a month or a year of history reads hundreds of rows per probe, not tens of thousands. The
// migration creates it WITHOUT ROWID (drizzle has no option for it): a probe's hours then sit
// together in the primary key's b-tree, so a range is one sequential read and an upsert
// touches one b-tree, not a table and its index.
export const rollupsHourly = sqliteTable(
  "rollups_hourly",
  {
    probeId: integer("probe_id").notNull(),
    hour: integer("hour").notNull(), // ms epoch of the hour start
    min: real("min").notNull(),
    max: real("max").notNull(),
    sum: real("sum").notNull(),
    count: integer("count").notNull(),
  },
  (t) => [primaryKey({ columns: [t.probeId, t.hour] })],
);

export const holds = sqliteTable(
  "holds",
  {
    id: id(),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id),
    probeId: integer("probe_id").references(() => probes.id),
    reason: text("reason").notNull(),
    placedBy: integer("placed_by").references(() => users.id),
    placedAt: integer("placed_at").notNull(),
    plannedEndAt: integer("planned_end_at").notNull(),
    releasedAt: integer("released_at"),
    releasedBy: integer("released_by").references(() => users.id),
    releaseKind: text("release_kind", { enum: ["manual", "expired"] }),
    // When the retained dosing-inhibit command (and the later resume) reached the broker; null
    // while unsent, so the ingest retries a command the web could not deliver.
    dosingInhibitSentAt: integer("dosing_inhibit_sent_at"),
    dosingResumeSentAt: integer("dosing_resume_sent_at"),
  },
  (t) => [index("holds_tank_idx").on(t.tankId, t.placedAt)],
);

export const alertRules = sqliteTable("alert_rules", {
  id: id(),
  orgId: integer("org_id")
    .notNull()
    .references(() => organisations.id),
  tankId: integer("tank_id").references(() => tanks.id), // null: every tank of the org
  cause: text("cause").notNull(),
  enabled: integer("enabled", { mode: "boolean" }).notNull().default(true),
  settings: text("settings", { mode: "json" }).$type<Record<string, number>>().notNull().default({}),
  // Where alerts on readings from a lapsed calibration go, when not the on-shift role.
  lapsedRouteRole: text("lapsed_route_role", { enum: ROLES }),
});

export const incidents = sqliteTable(
  "incidents",
  {
    id: id(),
    orgId: integer("org_id")
      .notNull()
      .references(() => organisations.id),
    siteId: integer("site_id")
      .notNull()
      .references(() => sites.id),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id),
    probeId: integer("probe_id").references(() => probes.id),
    cause: text("cause").notNull(),
    measure: text("measure"),
    severity: text("severity", { enum: ["warning", "critical"] }).notNull().default("warning"),
    state: text("state", { enum: INCIDENT_STATES }).notNull(),
    message: text("message").notNull(),
    calibrationLapsed: integer("calibration_lapsed", { mode: "boolean" }).notNull().default(false),
    openedAt: integer("opened_at").notNull(),
    acknowledgedAt: integer("acknowledged_at"),
    acknowledgedBy: integer("acknowledged_by").references(() => users.id),
    clearedAt: integer("cleared_at"), // condition cleared; auto-resolve after it stays clear
    resolvedAt: integer("resolved_at"),
    resolvedBy: integer("resolved_by").references(() => users.id),
    escalatedAt: integer("escalated_at"),
  },
  (t) => [
    index("incidents_org_state_idx").on(t.orgId, t.state),
    index("incidents_tank_cause_idx").on(t.tankId, t.cause, t.state),
    index("incidents_opened_idx").on(t.openedAt),
  ],
);

export const INCIDENT_EVENT_KINDS = [
  "opened",
  "notified",
  "acknowledged",
  "note",
  "held",
  "cleared",
  "escalated",
  "resolved",
  "reopened",
] as const;
export const incidentEvents = sqliteTable(
  "incident_events",
  {
    id: id(),
    incidentId: integer("incident_id")
      .notNull()
      .references(() => incidents.id),
    at: integer("at").notNull(),
    kind: text("kind", { enum: INCIDENT_EVENT_KINDS }).notNull(),
    userId: integer("user_id").references(() => users.id),
    detail: text("detail"),
  },
  (t) => [index("incident_events_incident_idx").on(t.incidentId, t.at)],
);

export const notifications = sqliteTable(
  "notifications",
  {
    id: id(),
    orgId: integer("org_id")
      .notNull()
      .references(() => organisations.id),
    incidentId: integer("incident_id").references(() => incidents.id),
    userId: integer("user_id").references(() => users.id),
    kind: text("kind", { enum: ["incident", "escalation", "digest", "invitation"] }).notNull(),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    status: text("status", { enum: ["sent", "failed"] }).notNull(),
    error: text("error"),
    sentAt: integer("sent_at").notNull(),
  },
  (t) => [index("notifications_incident_idx").on(t.incidentId)],
);

export const uploads = sqliteTable("uploads", {
  id: id(),
  orgId: integer("org_id")
    .notNull()
    .references(() => organisations.id),
  filename: text("filename").notNull(),
  mime: text("mime").notNull(),
  size: integer("size").notNull(),
  storageKey: text("storage_key").notNull(),
  uploadedBy: integer("uploaded_by").references(() => users.id),
  createdAt: createdAt(),
});

export const spotChecks = sqliteTable(
  "spot_checks",
  {
    id: id(),
    probeId: integer("probe_id")
      .notNull()
      .references(() => probes.id),
    takenAt: integer("taken_at").notNull(),
    meterValue: real("meter_value").notNull(),
    tidewellValue: real("tidewell_value"),
    // When the Tidewell reading compared against was taken (nearest within ±2 min).
    tidewellTs: integer("tidewell_ts"),
    difference: real("difference"),
    pastTolerance: integer("past_tolerance", { mode: "boolean" }).notNull().default(false),
    enteredBy: integer("entered_by").references(() => users.id),
    note: text("note"),
    createdAt: createdAt(),
  },
  (t) => [index("spot_checks_probe_idx").on(t.probeId, t.takenAt)],
);

export const auditLog = sqliteTable(
  "audit_log",
  {
    id: id(),
    orgId: integer("org_id")
      .notNull()
      .references(() => organisations.id),
    at: integer("at").notNull(),
    userId: integer("user_id").references(() => users.id),
    action: text("action").notNull(), // e.g. "hold.place", "tank.update"
    entity: text("entity").notNull(),
    entityId: integer("entity_id"),
    detail: text("detail", { mode: "json" }).$type<Record<string, unknown>>(),
  },
  (t) => [index("audit_org_at_idx").on(t.orgId, t.at)],
);

// Payloads the ingest refused, a sample per reason for diagnosis.
export const deadLetters = sqliteTable(
  "dead_letters",
  {
    id: id(),
    at: integer("at").notNull(),
    topic: text("topic").notNull(),
    reason: text("reason").notNull(),
    sample: text("sample").notNull(),
  },
  (t) => [index("dead_letters_reason_idx").on(t.reason)],
);

// Single-row-per-worker health snapshot the ingest writes and the web reads.
export const workerStatus = sqliteTable("worker_status", {
  name: text("name").primaryKey(),
  updatedAt: integer("updated_at").notNull(),
  stats: text("stats", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
});

// A lease held by one process among several (the alert runner when ingest workers share one
// broker subscription): whoever holds an unexpired lease does the job; `cursor` is how far it got.
export const leases = sqliteTable("leases", {
  name: text("name").primaryKey(),
  holder: text("holder").notNull(),
  expiresAt: integer("expires_at").notNull(),
  cursor: integer("cursor").notNull().default(0),
});

// Alert engine state per probe/tank, persisted so restarts do not fire twice.
export const alertState = sqliteTable("alert_state", {
  key: text("key").primaryKey(), // "probe:12" or "tank:3"
  state: text("state", { mode: "json" }).$type<unknown>().notNull(),
  updatedAt: integer("updated_at").notNull(),
});

export const signInAttempts = sqliteTable("sign_in_attempts", {
  key: text("key").primaryKey(), // "{address} {e-mail}" or "account {e-mail}" (lower-cased e-mail)
  failures: integer("failures").notNull().default(0),
  lastFailureAt: integer("last_failure_at").notNull(),
  lockedUntil: integer("locked_until"),
});

// Single-use signed links (acknowledge from mail, invitations): the jti is recorded on use.
export const usedTokens = sqliteTable("used_tokens", {
  jti: text("jti").primaryKey(),
  usedAt: integer("used_at").notNull(),
});

export const organisationsRelations = relations(organisations, ({ many }) => ({
  users: many(users),
  sites: many(sites),
}));
export const usersRelations = relations(users, ({ one }) => ({
  organisation: one(organisations, { fields: [users.orgId], references: [organisations.id] }),
}));
export const sitesRelations = relations(sites, ({ one, many }) => ({
  organisation: one(organisations, { fields: [sites.orgId], references: [organisations.id] }),
  zones: many(zones),
  tanks: many(tanks),
}));
export const zonesRelations = relations(zones, ({ one, many }) => ({
  site: one(sites, { fields: [zones.siteId], references: [sites.id] }),
  tanks: many(tanks),
}));
export const tanksRelations = relations(tanks, ({ one, many }) => ({
  site: one(sites, { fields: [tanks.siteId], references: [sites.id] }),
  zone: one(zones, { fields: [tanks.zoneId], references: [zones.id] }),
  probes: many(probes),
  holds: many(holds),
  incidents: many(incidents),
}));
export const devicesRelations = relations(devices, ({ one }) => ({
  tank: one(tanks, { fields: [devices.tankId], references: [tanks.id] }),
}));
export const probesRelations = relations(probes, ({ one, many }) => ({
  tank: one(tanks, { fields: [probes.tankId], references: [tanks.id] }),
  runs: many(calibrationRuns),
  spotChecks: many(spotChecks),
}));
export const calibrationRunsRelations = relations(calibrationRuns, ({ one, many }) => ({
  probe: one(probes, { fields: [calibrationRuns.probeId], references: [probes.id] }),
  tank: one(tanks, { fields: [calibrationRuns.tankId], references: [tanks.id] }),
  startedByUser: one(users, { fields: [calibrationRuns.startedBy], references: [users.id] }),
  points: many(calibrationPoints),
}));
export const calibrationPointsRelations = relations(calibrationPoints, ({ one }) => ({
  run: one(calibrationRuns, { fields: [calibrationPoints.runId], references: [calibrationRuns.id] }),
}));
export const holdsRelations = relations(holds, ({ one }) => ({
  tank: one(tanks, { fields: [holds.tankId], references: [tanks.id] }),
  placedByUser: one(users, { fields: [holds.placedBy], references: [users.id] }),
}));
export const incidentsRelations = relations(incidents, ({ one, many }) => ({
  tank: one(tanks, { fields: [incidents.tankId], references: [tanks.id] }),
  site: one(sites, { fields: [incidents.siteId], references: [sites.id] }),
  probe: one(probes, { fields: [incidents.probeId], references: [probes.id] }),
  events: many(incidentEvents),
  acknowledgedByUser: one(users, { fields: [incidents.acknowledgedBy], references: [users.id] }),
}));
export const incidentEventsRelations = relations(incidentEvents, ({ one }) => ({
  incident: one(incidents, { fields: [incidentEvents.incidentId], references: [incidents.id] }),
  user: one(users, { fields: [incidentEvents.userId], references: [users.id] }),
}));
export const spotChecksRelations = relations(spotChecks, ({ one }) => ({
  probe: one(probes, { fields: [spotChecks.probeId], references: [probes.id] }),
}));
