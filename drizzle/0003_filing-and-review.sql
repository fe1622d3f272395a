CREATE TABLE `certificates` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`filing_id` integer NOT NULL,
	`code` text NOT NULL,
	`data` text NOT NULL,
	`issued_at` integer NOT NULL,
	FOREIGN KEY (`filing_id`) REFERENCES `filings`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `certificates_code_unique` ON `certificates` (`code`);--> statement-breakpoint
CREATE UNIQUE INDEX `certificates_filing_unique` ON `certificates` (`filing_id`);--> statement-breakpoint
CREATE TABLE `filing_comments` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`filing_id` integer NOT NULL,
	`user_id` integer,
	`user_name` text NOT NULL,
	`role` text NOT NULL,
	`body` text NOT NULL,
	`at` integer NOT NULL,
	FOREIGN KEY (`filing_id`) REFERENCES `filings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `filing_comments_filing_idx` ON `filing_comments` (`filing_id`,`at`);--> statement-breakpoint
CREATE TABLE `filing_revisions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`filing_id` integer NOT NULL,
	`number` integer NOT NULL,
	`snapshot` text NOT NULL,
	`check` text NOT NULL,
	`verdict` text NOT NULL,
	`rule_set_version_id` integer,
	`submitted_by_id` integer,
	`submitted_by_name` text NOT NULL,
	`submitted_at` integer NOT NULL,
	FOREIGN KEY (`filing_id`) REFERENCES `filings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`rule_set_version_id`) REFERENCES `rule_set_versions`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`submitted_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `filing_revisions_number_unique` ON `filing_revisions` (`filing_id`,`number`);--> statement-breakpoint
CREATE TABLE `filing_transitions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`filing_id` integer NOT NULL,
	`action` text NOT NULL,
	`from_state` text,
	`to_state` text NOT NULL,
	`user_id` integer,
	`user_name` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`revision` integer,
	`at` integer NOT NULL,
	FOREIGN KEY (`filing_id`) REFERENCES `filings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `filing_transitions_filing_idx` ON `filing_transitions` (`filing_id`,`at`);--> statement-breakpoint
CREATE TABLE `filings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`test_id` integer NOT NULL,
	`project_id` integer NOT NULL,
	`rater_id` integer NOT NULL,
	`jurisdiction_id` integer NOT NULL,
	`status` text NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`change_token` text NOT NULL,
	`revision` integer DEFAULT 0 NOT NULL,
	`reviewer_id` integer,
	`reviewer_name` text,
	`return_reason` text,
	`first_submitted_at` integer,
	`submitted_at` integer,
	`decided_at` integer,
	`address_line` text NOT NULL,
	`city` text NOT NULL,
	`permit_number` text NOT NULL,
	`permit_date` text NOT NULL,
	`rater_name` text NOT NULL,
	`stage` text NOT NULL,
	`tested_on` text NOT NULL,
	`zone` text,
	`verdict` text,
	`cfm50` real,
	`ach50` real,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`test_id`) REFERENCES `test_records`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`rater_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`jurisdiction_id`) REFERENCES `jurisdictions`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`reviewer_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `filings_test_unique` ON `filings` (`test_id`);--> statement-breakpoint
CREATE INDEX `filings_rater_idx` ON `filings` (`rater_id`,`updated_at`);--> statement-breakpoint
CREATE INDEX `filings_project_idx` ON `filings` (`project_id`);--> statement-breakpoint
CREATE INDEX `filings_queue_submitted_idx` ON `filings` (`jurisdiction_id`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `filings_queue_status_idx` ON `filings` (`jurisdiction_id`,`status`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `filings_queue_count_idx` ON `filings` (`jurisdiction_id`,`status`,`verdict`,`zone`,`rater_id`);--> statement-breakpoint
CREATE INDEX `filings_queue_verdict_idx` ON `filings` (`jurisdiction_id`,`verdict`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `filings_queue_zone_idx` ON `filings` (`jurisdiction_id`,`zone`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `filings_queue_rater_idx` ON `filings` (`jurisdiction_id`,`rater_id`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `filings_queue_permit_idx` ON `filings` (`jurisdiction_id`,`permit_date`);--> statement-breakpoint
CREATE INDEX `filings_queue_address_idx` ON `filings` (`jurisdiction_id`,`address_line`);--> statement-breakpoint
CREATE INDEX `filings_queue_ach50_idx` ON `filings` (`jurisdiction_id`,`ach50`);--> statement-breakpoint
CREATE INDEX `filings_submitted_idx` ON `filings` (`submitted_at`);--> statement-breakpoint
CREATE TABLE `mail_captures` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`message_id` text,
	`envelope_from` text NOT NULL,
	`envelope_to` text NOT NULL,
	`raw` text NOT NULL,
	`received_at` integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX `mail_captures_message_idx` ON `mail_captures` (`message_id`);--> statement-breakpoint
CREATE TABLE `mail_outbox` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`kind` text NOT NULL,
	`to_address` text NOT NULL,
	`subject` text NOT NULL,
	`body` text NOT NULL,
	`filing_id` integer,
	`status` text DEFAULT 'queued' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at` integer NOT NULL,
	`claimed_at` integer,
	`last_error` text,
	`message_id` text,
	`sent_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`filing_id`) REFERENCES `filings`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `mail_outbox_due_idx` ON `mail_outbox` (`status`,`next_attempt_at`);--> statement-breakpoint
CREATE INDEX `mail_outbox_created_idx` ON `mail_outbox` (`created_at`);--> statement-breakpoint
CREATE TABLE `projects` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`owner_id` integer NOT NULL,
	`jurisdiction_id` integer,
	`address_line` text NOT NULL,
	`city` text NOT NULL,
	`state_code` text NOT NULL,
	`postal_code` text NOT NULL,
	`county_fips` text NOT NULL,
	`permit_number` text NOT NULL,
	`permit_date` text NOT NULL,
	`builder_company` text DEFAULT '' NOT NULL,
	`builder_contact` text DEFAULT '' NOT NULL,
	`building_type` text NOT NULL,
	`units` text NOT NULL,
	`volume` real NOT NULL,
	`floor_area` real,
	`enclosure_area` real,
	`height` real,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`jurisdiction_id`) REFERENCES `jurisdictions`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `projects_owner_idx` ON `projects` (`owner_id`,`updated_at`);--> statement-breakpoint
CREATE TABLE `test_records` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`tested_on` text NOT NULL,
	`stage` text NOT NULL,
	`tester` text DEFAULT '' NOT NULL,
	`equipment` text DEFAULT '' NOT NULL,
	`wind` text NOT NULL,
	`inside_temperature` real,
	`outside_temperature` real,
	`direction` text NOT NULL,
	`baseline_before` real,
	`baseline_after` real,
	`readings` text DEFAULT '[]' NOT NULL,
	`assumed_exponent` real,
	`safety` text DEFAULT '[]' NOT NULL,
	`stated_cfm50` real,
	`stated_ach50` real,
	`notes` text DEFAULT '' NOT NULL,
	`verdict` text,
	`cfm50` real,
	`ach50` real,
	`rule_set_version_id` integer,
	`checked_at` integer,
	`check` text,
	`check_problem` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`rule_set_version_id`) REFERENCES `rule_set_versions`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `test_records_project_idx` ON `test_records` (`project_id`,`tested_on`);--> statement-breakpoint
CREATE TABLE `uploads` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`test_id` integer,
	`storage_key` text NOT NULL,
	`kind` text NOT NULL,
	`content_type` text NOT NULL,
	`name` text NOT NULL,
	`size` integer NOT NULL,
	`sha256` text NOT NULL,
	`uploaded_by_id` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`test_id`) REFERENCES `test_records`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `uploads_key_unique` ON `uploads` (`storage_key`);--> statement-breakpoint
CREATE INDEX `uploads_test_idx` ON `uploads` (`test_id`);--> statement-breakpoint
CREATE INDEX `uploads_project_idx` ON `uploads` (`project_id`);