CREATE TABLE `domain_events` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`kind` text NOT NULL,
	`subject_id` text NOT NULL,
	`person_id` text,
	`payload` text,
	`processed_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `domain_events_once` ON `domain_events` (`kind`,`subject_id`);--> statement-breakpoint
CREATE INDEX `domain_events_pending` ON `domain_events` (`processed_at`);--> statement-breakpoint
ALTER TABLE `accommodations` ADD `revoked_at` integer;--> statement-breakpoint
ALTER TABLE `accommodations` ADD `revoked_by` text REFERENCES people(id);--> statement-breakpoint
ALTER TABLE `attempts` ADD `attempt_number` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `attempts` ADD `allowed_seconds` integer;--> statement-breakpoint
ALTER TABLE `attempts` ADD `accommodation_id` text;--> statement-breakpoint
ALTER TABLE `attempts` ADD `layout` text DEFAULT 'one' NOT NULL;--> statement-breakpoint
ALTER TABLE `attempts` ADD `last_position` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `attempts` ADD `raw_score` real;--> statement-breakpoint
ALTER TABLE `attempts` ADD `max_score` real;--> statement-breakpoint
ALTER TABLE `attempts` ADD `subscores` text;--> statement-breakpoint
CREATE INDEX `attempts_open_deadline` ON `attempts` (`submitted_at`,`deadline_at`);--> statement-breakpoint
ALTER TABLE `exam_versions` ADD `ordering_scoring` text DEFAULT 'exact' NOT NULL;