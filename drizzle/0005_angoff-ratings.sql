CREATE TABLE `angoff_ratings` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`exam_id` text NOT NULL,
	`judge_id` text NOT NULL,
	`item_id` text NOT NULL,
	`round` integer DEFAULT 1 NOT NULL,
	`rating` real NOT NULL,
	`updated_at` integer NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`exam_id`) REFERENCES `exams`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`judge_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `angoff_ratings_once` ON `angoff_ratings` (`exam_id`,`judge_id`,`item_id`,`round`);--> statement-breakpoint
CREATE INDEX `angoff_ratings_exam` ON `angoff_ratings` (`exam_id`);