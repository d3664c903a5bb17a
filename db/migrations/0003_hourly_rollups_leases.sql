CREATE TABLE `leases` (
	`name` text PRIMARY KEY NOT NULL,
	`holder` text NOT NULL,
	`expires_at` integer NOT NULL,
	`cursor` integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE `rollups_hourly` (
	`probe_id` integer NOT NULL,
	`hour` integer NOT NULL,
	`min` real NOT NULL,
	`max` real NOT NULL,
	`sum` real NOT NULL,
	`count` integer NOT NULL,
	PRIMARY KEY(`probe_id`, `hour`)
) WITHOUT ROWID;
--> statement-breakpoint
INSERT INTO `rollups_hourly` (`probe_id`, `hour`, `min`, `max`, `sum`, `count`)
  SELECT `probe_id`, (`minute` / 3600000) * 3600000, min(`min`), max(`max`), sum(`sum`), sum(`count`) FROM `rollups` GROUP BY 1, 2;
