ALTER TABLE `calibration_points` ADD `client_key` text;--> statement-breakpoint
CREATE UNIQUE INDEX `points_run_client_key_unique` ON `calibration_points` (`run_id`,`client_key`);