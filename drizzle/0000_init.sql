CREATE TABLE `organisations` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`slug` text NOT NULL,
	`time_zone` text DEFAULT 'America/Chicago' NOT NULL,
	`settings` text DEFAULT '{}' NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `organisations_slug_unique` ON `organisations` (`slug`);--> statement-breakpoint
CREATE TABLE `people` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`employee_id` text,
	`title` text,
	`credential_letters` text,
	`hire_date` text,
	`home_unit_id` text,
	`birth_month` integer,
	`active` integer DEFAULT true NOT NULL,
	`signing_pin_hash` text,
	`signing_pin_failures` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`home_unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `people_email_unique` ON `people` (`email`);--> statement-breakpoint
CREATE INDEX `people_org` ON `people` (`org_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `people_org_employee` ON `people` (`org_id`,`employee_id`);--> statement-breakpoint
CREATE TABLE `person_roles` (
	`person_id` text NOT NULL,
	`org_id` text NOT NULL,
	`role` text NOT NULL,
	`granted_by` text,
	`created_at` integer NOT NULL,
	PRIMARY KEY(`person_id`, `role`),
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `person_roles_org` ON `person_roles` (`org_id`);--> statement-breakpoint
CREATE TABLE `person_units` (
	`person_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`org_id` text NOT NULL,
	`relation` text NOT NULL,
	PRIMARY KEY(`person_id`, `unit_id`, `relation`),
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `units` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`name` text NOT NULL,
	`code` text NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `units_org_code` ON `units` (`org_id`,`code`);--> statement-breakpoint
CREATE UNIQUE INDEX `units_org_name` ON `units` (`org_id`,`name`);--> statement-breakpoint
CREATE TABLE `api_tokens` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`name` text NOT NULL,
	`token_hash` text NOT NULL,
	`prefix` text NOT NULL,
	`scopes` text NOT NULL,
	`expires_at` integer,
	`revoked_at` integer,
	`last_used_at` integer,
	`created_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `api_tokens_token_hash_unique` ON `api_tokens` (`token_hash`);--> statement-breakpoint
CREATE INDEX `api_tokens_org` ON `api_tokens` (`org_id`);--> statement-breakpoint
CREATE TABLE `files` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`owner_id` text,
	`purpose` text NOT NULL,
	`mime_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`sha256` text NOT NULL,
	`storage_path` text NOT NULL,
	`original_name` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`owner_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `files_org` ON `files` (`org_id`);--> statement-breakpoint
CREATE TABLE `rate_limit_hits` (
	`key` text PRIMARY KEY NOT NULL,
	`window_start` integer NOT NULL,
	`count` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `sessions` (
	`id` text PRIMARY KEY NOT NULL,
	`person_id` text NOT NULL,
	`org_id` text NOT NULL,
	`expires_at` integer NOT NULL,
	`ended_at` integer,
	`user_agent` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `sessions_person` ON `sessions` (`person_id`);--> statement-breakpoint
CREATE TABLE `sign_in_codes` (
	`id` text PRIMARY KEY NOT NULL,
	`email` text NOT NULL,
	`code_hash` text NOT NULL,
	`person_id` text,
	`expires_at` integer NOT NULL,
	`consumed_at` integer,
	`attempts` integer DEFAULT 0 NOT NULL,
	`client_key` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `sign_in_codes_email` ON `sign_in_codes` (`email`);--> statement-breakpoint
CREATE INDEX `sign_in_codes_hash` ON `sign_in_codes` (`code_hash`);--> statement-breakpoint
CREATE TABLE `item_version_topics` (
	`item_version_id` text NOT NULL,
	`topic_id` text NOT NULL,
	PRIMARY KEY(`item_version_id`, `topic_id`),
	FOREIGN KEY (`item_version_id`) REFERENCES `item_versions`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`topic_id`) REFERENCES `topics`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `item_versions` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`item_id` text NOT NULL,
	`version` integer NOT NULL,
	`type` text NOT NULL,
	`stem` text NOT NULL,
	`body` text NOT NULL,
	`scenario` text,
	`rationale` text NOT NULL,
	`reference` text NOT NULL,
	`created_by` text,
	`reviewed_by` text,
	`published_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`item_id`) REFERENCES `items`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`reviewed_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `item_versions_item_version` ON `item_versions` (`item_id`,`version`);--> statement-breakpoint
CREATE TABLE `items` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`current_version_id` text,
	`author_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`author_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `items_org` ON `items` (`org_id`);--> statement-breakpoint
CREATE TABLE `topics` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`slug` text NOT NULL,
	`name` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `topics_org_slug` ON `topics` (`org_id`,`slug`);--> statement-breakpoint
CREATE TABLE `accommodations` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`kind` text NOT NULL,
	`multiplier` real,
	`reason` text NOT NULL,
	`ends_on` text,
	`granted_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`granted_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `assignments` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`kind` text NOT NULL,
	`exam_id` text,
	`checklist_id` text,
	`requirement_id` text,
	`via_unit_id` text,
	`via_role` text,
	`due_on` text NOT NULL,
	`status` text DEFAULT 'open' NOT NULL,
	`completed_at` integer,
	`assigned_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`exam_id`) REFERENCES `exams`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`checklist_id`) REFERENCES `checklists`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`via_unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`assigned_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `assignments_person` ON `assignments` (`person_id`);--> statement-breakpoint
CREATE INDEX `assignments_org` ON `assignments` (`org_id`);--> statement-breakpoint
CREATE TABLE `attempts` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`exam_version_id` text NOT NULL,
	`assignment_id` text,
	`seed` integer NOT NULL,
	`form` text NOT NULL,
	`started_at` integer NOT NULL,
	`deadline_at` integer,
	`submitted_at` integer,
	`closed_reason` text,
	`score_percent` real,
	`passed` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`exam_version_id`) REFERENCES `exam_versions`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`assignment_id`) REFERENCES `assignments`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `attempts_person` ON `attempts` (`person_id`);--> statement-breakpoint
CREATE INDEX `attempts_exam_version` ON `attempts` (`exam_version_id`);--> statement-breakpoint
CREATE TABLE `exam_versions` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`exam_id` text NOT NULL,
	`version` integer NOT NULL,
	`description` text,
	`blueprint` text NOT NULL,
	`time_limit_minutes` integer,
	`pass_mark_percent` real NOT NULL,
	`attempts_allowed` integer DEFAULT 2 NOT NULL,
	`shuffle_items` integer DEFAULT true NOT NULL,
	`shuffle_options` integer DEFAULT true NOT NULL,
	`review_policy` text DEFAULT 'score-and-topics' NOT NULL,
	`multiple_response_scoring` text DEFAULT 'all-or-nothing' NOT NULL,
	`available_from` text,
	`available_until` text,
	`published_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`exam_id`) REFERENCES `exams`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `exam_versions_exam_version` ON `exam_versions` (`exam_id`,`version`);--> statement-breakpoint
CREATE TABLE `exams` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`title` text NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`current_version_id` text,
	`created_by` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `exams_org` ON `exams` (`org_id`);--> statement-breakpoint
CREATE TABLE `responses` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`attempt_id` text NOT NULL,
	`item_version_id` text NOT NULL,
	`position` integer NOT NULL,
	`answer` text,
	`flagged` integer DEFAULT false NOT NULL,
	`score` real,
	`saved_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`attempt_id`) REFERENCES `attempts`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`item_version_id`) REFERENCES `item_versions`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `responses_attempt_position` ON `responses` (`attempt_id`,`position`);--> statement-breakpoint
CREATE TABLE `addenda` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`record_type` text NOT NULL,
	`record_id` text NOT NULL,
	`author_id` text NOT NULL,
	`text` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`author_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `checklist_versions` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`checklist_id` text NOT NULL,
	`version` integer NOT NULL,
	`method` text NOT NULL,
	`steps` text NOT NULL,
	`references` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`checklist_id`) REFERENCES `checklists`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `checklist_versions_version` ON `checklist_versions` (`checklist_id`,`version`);--> statement-breakpoint
CREATE TABLE `checklists` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`title` text NOT NULL,
	`skill` text NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`current_version_id` text,
	`created_by` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `checklists_org` ON `checklists` (`org_id`);--> statement-breakpoint
CREATE TABLE `checkoff_step_results` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`checkoff_id` text NOT NULL,
	`step_index` integer NOT NULL,
	`result` text NOT NULL,
	`comment` text,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`checkoff_id`) REFERENCES `checkoffs`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `checkoff_step_results_step` ON `checkoff_step_results` (`checkoff_id`,`step_index`);--> statement-breakpoint
CREATE TABLE `checkoffs` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`checklist_version_id` text NOT NULL,
	`preceptor_id` text,
	`assignment_id` text,
	`status` text DEFAULT 'requested' NOT NULL,
	`outcome` text,
	`practice_plan` text,
	`practice_by` text,
	`content_hash` text,
	`started_at` integer,
	`signed_at` integer,
	`acknowledged_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`checklist_version_id`) REFERENCES `checklist_versions`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`preceptor_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `checkoffs_person` ON `checkoffs` (`person_id`);--> statement-breakpoint
CREATE INDEX `checkoffs_org` ON `checkoffs` (`org_id`);--> statement-breakpoint
CREATE TABLE `orientation_plan_items` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`plan_id` text NOT NULL,
	`position` integer NOT NULL,
	`kind` text NOT NULL,
	`exam_id` text,
	`checklist_id` text,
	`title` text NOT NULL,
	`due_on` text,
	`completed_at` integer,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`plan_id`) REFERENCES `orientation_plans`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`checklist_id`) REFERENCES `checklists`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `orientation_plans` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`preceptor_id` text,
	`starts_on` text NOT NULL,
	`ends_on` text NOT NULL,
	`status` text DEFAULT 'active' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`preceptor_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `signatures` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`signer_id` text NOT NULL,
	`record_type` text NOT NULL,
	`record_id` text NOT NULL,
	`meaning` text NOT NULL,
	`printed_name` text NOT NULL,
	`credential_letters` text,
	`signed_at` integer NOT NULL,
	`time_zone` text NOT NULL,
	`content_hash` text NOT NULL,
	`method` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`signer_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `signatures_record` ON `signatures` (`record_type`,`record_id`);--> statement-breakpoint
CREATE TABLE `certificates` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`requirement_id` text,
	`source_type` text NOT NULL,
	`source_id` text NOT NULL,
	`title` text NOT NULL,
	`code` text NOT NULL,
	`issued_on` text NOT NULL,
	`valid_through` text,
	`signer_name` text NOT NULL,
	`revoked_at` integer,
	`revoked_reason` text,
	`revoked_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`requirement_id`) REFERENCES `requirements`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`revoked_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `certificates_code_unique` ON `certificates` (`code`);--> statement-breakpoint
CREATE INDEX `certificates_person` ON `certificates` (`person_id`);--> statement-breakpoint
CREATE TABLE `clearances` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`checklist_id` text NOT NULL,
	`level` text NOT NULL,
	`reason` text,
	`derived_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`checklist_id`) REFERENCES `checklists`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `clearances_person_unit_skill` ON `clearances` (`person_id`,`unit_id`,`checklist_id`);--> statement-breakpoint
CREATE TABLE `credential_types` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`category` text NOT NULL,
	`rule` text NOT NULL,
	`never_expires_if_issued_before` text,
	`reinstatement_months` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `credential_types_org_code` ON `credential_types` (`org_id`,`code`);--> statement-breakpoint
CREATE TABLE `credentials` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`credential_type_id` text NOT NULL,
	`number` text,
	`issuer` text,
	`issued_on` text NOT NULL,
	`valid_through` text,
	`scan_file_id` text,
	`verified_by` text,
	`verified_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`credential_type_id`) REFERENCES `credential_types`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`scan_file_id`) REFERENCES `files`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`verified_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `credentials_person` ON `credentials` (`person_id`);--> statement-breakpoint
CREATE INDEX `credentials_org` ON `credentials` (`org_id`);--> statement-breakpoint
CREATE TABLE `extensions` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`requirement_id` text NOT NULL,
	`new_due_on` text NOT NULL,
	`reason` text NOT NULL,
	`granted_by` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`requirement_id`) REFERENCES `requirements`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`granted_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `regulatory_references` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`code` text NOT NULL,
	`title` text NOT NULL,
	`body` text DEFAULT '' NOT NULL,
	`last_verified_on` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `reminders` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`requirement_id` text NOT NULL,
	`due_on` text NOT NULL,
	`threshold` text NOT NULL,
	`sent_at` integer,
	`message_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`requirement_id`) REFERENCES `requirements`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `reminders_once` ON `reminders` (`person_id`,`requirement_id`,`due_on`,`threshold`);--> statement-breakpoint
CREATE TABLE `requirements` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`name` text NOT NULL,
	`kind` text NOT NULL,
	`exam_id` text,
	`checklist_id` text,
	`credential_type_id` text,
	`recurrence` text,
	`grace_days` integer DEFAULT 0 NOT NULL,
	`unit_id` text,
	`role` text,
	`regulatory_reference_id` text,
	`lapse_leaves` text DEFAULT 'not-cleared' NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`exam_id`) REFERENCES `exams`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`checklist_id`) REFERENCES `checklists`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`credential_type_id`) REFERENCES `credential_types`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`regulatory_reference_id`) REFERENCES `regulatory_references`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `requirements_org` ON `requirements` (`org_id`);--> statement-breakpoint
CREATE TABLE `waivers` (
	`id` text PRIMARY KEY NOT NULL,
	`org_id` text NOT NULL,
	`person_id` text NOT NULL,
	`requirement_id` text NOT NULL,
	`reason` text NOT NULL,
	`ends_on` text NOT NULL,
	`granted_by` text NOT NULL,
	`revoked_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`org_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`requirement_id`) REFERENCES `requirements`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`granted_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `audit_events` (
	`seq` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`org_id` text,
	`actor_id` text,
	`action` text NOT NULL,
	`entity_type` text NOT NULL,
	`entity_id` text,
	`detail` text DEFAULT '{}' NOT NULL,
	`at` text NOT NULL,
	`prev_hash` text NOT NULL,
	`hash` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `audit_events_org` ON `audit_events` (`org_id`);--> statement-breakpoint
CREATE INDEX `audit_events_entity` ON `audit_events` (`entity_type`,`entity_id`);