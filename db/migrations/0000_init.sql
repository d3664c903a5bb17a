CREATE TABLE `alert_rules` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`tank_id` integer,
	`cause` text NOT NULL,
	`enabled` integer DEFAULT true NOT NULL,
	`settings` text DEFAULT '{}' NOT NULL,
	`lapsed_route_role` text,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `alert_state` (
	`key` text PRIMARY KEY NOT NULL,
	`state` text NOT NULL,
	`updated_at` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`at` integer NOT NULL,
	`user_id` integer,
	`action` text NOT NULL,
	`entity` text NOT NULL,
	`entity_id` integer,
	`detail` text,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `audit_org_at_idx` ON `audit_log` (`org_id`,`at`);--> statement-breakpoint
CREATE TABLE `calibration_points` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`run_id` integer NOT NULL,
	`seq` integer NOT NULL,
	`purpose` text NOT NULL,
	`standard` text NOT NULL,
	`lot` text,
	`expires_on` text,
	`mv` real,
	`conductance_us` real,
	`temp_c` real NOT NULL,
	`temp_source` text DEFAULT 'probe' NOT NULL,
	`expected` real,
	`captured_at` integer NOT NULL,
	`stable` integer DEFAULT true NOT NULL,
	`note` text,
	FOREIGN KEY (`run_id`) REFERENCES `calibration_runs`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `points_run_idx` ON `calibration_points` (`run_id`);--> statement-breakpoint
CREATE TABLE `calibration_runs` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`probe_id` integer NOT NULL,
	`tank_id` integer NOT NULL,
	`source` text NOT NULL,
	`status` text NOT NULL,
	`started_by` integer,
	`started_at` integer NOT NULL,
	`completed_at` integer,
	`effective_at` integer,
	`slope_pct` real,
	`offset_mv` real,
	`cell_constant` real,
	`deviation_pct` real,
	`reasons` text DEFAULT '[]' NOT NULL,
	`as_found_error_ph` real,
	`as_found_error_pct` real,
	`hold_id` integer,
	`upload_id` integer,
	`note` text,
	FOREIGN KEY (`probe_id`) REFERENCES `probes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`started_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `runs_probe_effective_idx` ON `calibration_runs` (`probe_id`,`effective_at`);--> statement-breakpoint
CREATE INDEX `runs_tank_idx` ON `calibration_runs` (`tank_id`);--> statement-breakpoint
CREATE TABLE `dead_letters` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at` integer NOT NULL,
	`topic` text NOT NULL,
	`reason` text NOT NULL,
	`sample` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `dead_letters_reason_idx` ON `dead_letters` (`reason`);--> statement-breakpoint
CREATE TABLE `devices` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`tank_id` integer,
	`controller_id` text NOT NULL,
	`username` text NOT NULL,
	`secret_hash` text NOT NULL,
	`revoked_at` integer,
	`last_seen_at` integer,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `devices_username_unique` ON `devices` (`username`);--> statement-breakpoint
CREATE INDEX `devices_controller_idx` ON `devices` (`controller_id`);--> statement-breakpoint
CREATE TABLE `holds` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`tank_id` integer NOT NULL,
	`probe_id` integer,
	`reason` text NOT NULL,
	`placed_by` integer,
	`placed_at` integer NOT NULL,
	`planned_end_at` integer NOT NULL,
	`released_at` integer,
	`released_by` integer,
	`release_kind` text,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`probe_id`) REFERENCES `probes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`placed_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`released_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `holds_tank_idx` ON `holds` (`tank_id`,`placed_at`);--> statement-breakpoint
CREATE TABLE `incident_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`incident_id` integer NOT NULL,
	`at` integer NOT NULL,
	`kind` text NOT NULL,
	`user_id` integer,
	`detail` text,
	FOREIGN KEY (`incident_id`) REFERENCES `incidents`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `incident_events_incident_idx` ON `incident_events` (`incident_id`,`at`);--> statement-breakpoint
CREATE TABLE `incidents` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`site_id` integer NOT NULL,
	`tank_id` integer NOT NULL,
	`probe_id` integer,
	`cause` text NOT NULL,
	`measure` text,
	`severity` text DEFAULT 'warning' NOT NULL,
	`state` text NOT NULL,
	`message` text NOT NULL,
	`calibration_lapsed` integer DEFAULT false NOT NULL,
	`opened_at` integer NOT NULL,
	`acknowledged_at` integer,
	`acknowledged_by` integer,
	`cleared_at` integer,
	`resolved_at` integer,
	`resolved_by` integer,
	`escalated_at` integer,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`probe_id`) REFERENCES `probes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`acknowledged_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`resolved_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `incidents_org_state_idx` ON `incidents` (`org_id`,`state`);--> statement-breakpoint
CREATE INDEX `incidents_tank_cause_idx` ON `incidents` (`tank_id`,`cause`,`state`);--> statement-breakpoint
CREATE INDEX `incidents_opened_idx` ON `incidents` (`opened_at`);--> statement-breakpoint
CREATE TABLE `notifications` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`incident_id` integer,
	`user_id` integer,
	`kind` text NOT NULL,
	`to_address` text NOT NULL,
	`subject` text NOT NULL,
	`status` text NOT NULL,
	`error` text,
	`sent_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`incident_id`) REFERENCES `incidents`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `notifications_incident_idx` ON `notifications` (`incident_id`);--> statement-breakpoint
CREATE TABLE `organisations` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL
);
--> statement-breakpoint
CREATE TABLE `probes` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`tank_id` integer NOT NULL,
	`kind` text NOT NULL,
	`serial` text NOT NULL,
	`nominal_cell_constant` real,
	`installed_at` integer NOT NULL,
	`retired_at` integer,
	`status` text DEFAULT 'active' NOT NULL,
	`replaced_by_id` integer,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `probes_tank_idx` ON `probes` (`tank_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `probes_serial_unique` ON `probes` (`serial`);--> statement-breakpoint
CREATE TABLE `readings` (
	`probe_id` integer NOT NULL,
	`ts` integer NOT NULL,
	`raw` real NOT NULL,
	`value` real,
	`quality` text NOT NULL,
	`calibration_run_id` integer,
	PRIMARY KEY(`probe_id`, `ts`)
);
--> statement-breakpoint
CREATE TABLE `rollups` (
	`probe_id` integer NOT NULL,
	`minute` integer NOT NULL,
	`min` real NOT NULL,
	`max` real NOT NULL,
	`sum` real NOT NULL,
	`count` integer NOT NULL,
	PRIMARY KEY(`probe_id`, `minute`)
);
--> statement-breakpoint
CREATE TABLE `sign_in_attempts` (
	`key` text PRIMARY KEY NOT NULL,
	`failures` integer DEFAULT 0 NOT NULL,
	`last_failure_at` integer NOT NULL,
	`locked_until` integer
);
--> statement-breakpoint
CREATE TABLE `sites` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`name` text NOT NULL,
	`time_zone` text DEFAULT 'UTC' NOT NULL,
	`day_start_hour` integer DEFAULT 7 NOT NULL,
	`night_start_hour` integer DEFAULT 19 NOT NULL,
	`day_role` text DEFAULT 'grower' NOT NULL,
	`night_role` text DEFAULT 'night_manager' NOT NULL,
	`escalate_after_minutes` integer DEFAULT 15 NOT NULL,
	`max_calibration_interval_days` integer DEFAULT 30 NOT NULL,
	`max_hold_minutes` integer DEFAULT 240 NOT NULL,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `spot_checks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`probe_id` integer NOT NULL,
	`taken_at` integer NOT NULL,
	`meter_value` real NOT NULL,
	`tidewell_value` real,
	`difference` real,
	`past_tolerance` integer DEFAULT false NOT NULL,
	`entered_by` integer,
	`note` text,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`probe_id`) REFERENCES `probes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`entered_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `spot_checks_probe_idx` ON `spot_checks` (`probe_id`,`taken_at`);--> statement-breakpoint
CREATE TABLE `tanks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`zone_id` integer,
	`name` text NOT NULL,
	`crop` text NOT NULL,
	`ph_min` real NOT NULL,
	`ph_max` real NOT NULL,
	`ec_min_us` real NOT NULL,
	`ec_max_us` real NOT NULL,
	`temp_min` real DEFAULT 18 NOT NULL,
	`temp_max` real DEFAULT 22 NOT NULL,
	`ec_alpha_per_c` real DEFAULT 0.019 NOT NULL,
	`spot_check_tolerance_ph` real DEFAULT 0.1 NOT NULL,
	`spot_check_tolerance_ec_us` real DEFAULT 100 NOT NULL,
	`calibration_interval_days` integer DEFAULT 30 NOT NULL,
	`controller_id` text,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`zone_id`) REFERENCES `zones`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `tanks_site_idx` ON `tanks` (`site_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `tanks_controller_unique` ON `tanks` (`controller_id`);--> statement-breakpoint
CREATE TABLE `uploads` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`filename` text NOT NULL,
	`mime` text NOT NULL,
	`size` integer NOT NULL,
	`storage_key` text NOT NULL,
	`uploaded_by` integer,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `used_tokens` (
	`jti` text PRIMARY KEY NOT NULL,
	`used_at` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` integer NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`role` text NOT NULL,
	`password_hash` text,
	`active` integer DEFAULT true NOT NULL,
	`ec_unit` text DEFAULT 'mS/cm' NOT NULL,
	`wall_sound` integer DEFAULT false NOT NULL,
	`notify_email` integer DEFAULT true NOT NULL,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);--> statement-breakpoint
CREATE TABLE `worker_status` (
	`name` text PRIMARY KEY NOT NULL,
	`updated_at` integer NOT NULL,
	`stats` text NOT NULL
);
--> statement-breakpoint
CREATE TABLE `zones` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`name` text NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action
);
