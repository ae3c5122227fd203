CREATE TABLE `manager_digests` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`manager_id` text NOT NULL,
	`week` text NOT NULL,
	`people` integer DEFAULT 0 NOT NULL,
	`sent_at` integer,
	`message_id` text,
	`failure` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`manager_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `manager_digests_once` ON `manager_digests` (`manager_id`,`week`);--> statement-breakpoint
CREATE TABLE `reminder_runs` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`ran_on` text NOT NULL,
	`trigger` text NOT NULL,
	`started_at` integer NOT NULL,
	`finished_at` integer NOT NULL,
	`sent` integer DEFAULT 0 NOT NULL,
	`emails` integer DEFAULT 0 NOT NULL,
	`failed` integer DEFAULT 0 NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `reminder_runs_org_ran` ON `reminder_runs` (`org_id`,`ran_on`);--> statement-breakpoint
ALTER TABLE `people` ADD `reminder_delivery` text DEFAULT 'each' NOT NULL;--> statement-breakpoint
ALTER TABLE `reminders` ADD `channel` text DEFAULT 'email' NOT NULL;--> statement-breakpoint
ALTER TABLE `reminders` ADD `failure` text;--> statement-breakpoint
CREATE INDEX `reminders_org_created` ON `reminders` (`org_id`,`created_at`);