CREATE TABLE `checks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` integer NOT NULL,
	`created_at` integer NOT NULL,
	`verdict` text NOT NULL,
	`jurisdiction_id` integer,
	`rule_set_version_id` integer,
	`zone` text,
	`county_fips` text,
	`address_line` text NOT NULL,
	`city` text NOT NULL,
	`state_code` text NOT NULL,
	`postal_code` text NOT NULL,
	`permit_date` text NOT NULL,
	`building_type` text NOT NULL,
	`cfm50` real NOT NULL,
	`ach50` real NOT NULL,
	`request` text NOT NULL,
	`response` text NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`jurisdiction_id`) REFERENCES `jurisdictions`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`rule_set_version_id`) REFERENCES `rule_set_versions`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `checks_user_idx` ON `checks` (`user_id`,`id`);