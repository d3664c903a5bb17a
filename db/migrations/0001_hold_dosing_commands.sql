ALTER TABLE `calibration_runs` ADD `planned_standards` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `calibration_runs` ADD `cleaned_at` integer;--> statement-breakpoint
ALTER TABLE `calibration_runs` ADD `as_found_skipped` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `holds` ADD `dosing_inhibit_sent_at` integer;--> statement-breakpoint
ALTER TABLE `holds` ADD `dosing_resume_sent_at` integer;