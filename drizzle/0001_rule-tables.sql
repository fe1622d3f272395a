CREATE TABLE `adopted_editions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`jurisdiction_id` integer NOT NULL,
	`name` text NOT NULL,
	`rule_set_id` integer NOT NULL,
	`zone_map_id` integer,
	`effective_from` text NOT NULL,
	`effective_until` text,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`jurisdiction_id`) REFERENCES `jurisdictions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`rule_set_id`) REFERENCES `rule_sets`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`zone_map_id`) REFERENCES `zone_maps`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `adopted_editions_jurisdiction_idx` ON `adopted_editions` (`jurisdiction_id`,`effective_from`);--> statement-breakpoint
CREATE INDEX `adopted_editions_rule_set_idx` ON `adopted_editions` (`rule_set_id`);--> statement-breakpoint
CREATE INDEX `adopted_editions_zone_map_idx` ON `adopted_editions` (`zone_map_id`);--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at` integer NOT NULL,
	`user_id` integer,
	`user_name` text NOT NULL,
	`action` text NOT NULL,
	`entity_type` text NOT NULL,
	`entity_id` integer NOT NULL,
	`summary` text NOT NULL,
	`before` text,
	`after` text,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_log_entity_idx` ON `audit_log` (`entity_type`,`entity_id`,`at`);--> statement-breakpoint
CREATE INDEX `audit_log_at_idx` ON `audit_log` (`at`);--> statement-breakpoint
CREATE TABLE `draft_rules` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`rule_set_id` integer NOT NULL,
	`key` text NOT NULL,
	`position` integer NOT NULL,
	`zones` text NOT NULL,
	`building_type` text NOT NULL,
	`kind` text NOT NULL,
	`logic` text NOT NULL,
	`summary` text DEFAULT '' NOT NULL,
	`citation_code` text NOT NULL,
	`citation_edition` text NOT NULL,
	`citation_section` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	FOREIGN KEY (`rule_set_id`) REFERENCES `rule_sets`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `draft_rules_set_key_unique` ON `draft_rules` (`rule_set_id`,`key`);--> statement-breakpoint
CREATE INDEX `draft_rules_set_position_idx` ON `draft_rules` (`rule_set_id`,`position`);--> statement-breakpoint
CREATE TABLE `jurisdiction_counties` (
	`jurisdiction_id` integer NOT NULL,
	`county_fips` text NOT NULL,
	PRIMARY KEY(`jurisdiction_id`, `county_fips`),
	FOREIGN KEY (`jurisdiction_id`) REFERENCES `jurisdictions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `jurisdiction_counties_fips_idx` ON `jurisdiction_counties` (`county_fips`);--> statement-breakpoint
CREATE TABLE `jurisdiction_postal_codes` (
	`jurisdiction_id` integer NOT NULL,
	`postal_code` text NOT NULL,
	PRIMARY KEY(`jurisdiction_id`, `postal_code`),
	FOREIGN KEY (`jurisdiction_id`) REFERENCES `jurisdictions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `jurisdiction_postal_codes_code_idx` ON `jurisdiction_postal_codes` (`postal_code`);--> statement-breakpoint
CREATE TABLE `rule_set_versions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`rule_set_id` integer NOT NULL,
	`number` integer NOT NULL,
	`note` text NOT NULL,
	`rules` text NOT NULL,
	`published_by_id` integer,
	`published_by_name` text NOT NULL,
	`published_at` integer NOT NULL,
	FOREIGN KEY (`rule_set_id`) REFERENCES `rule_sets`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`published_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `rule_set_versions_set_number_unique` ON `rule_set_versions` (`rule_set_id`,`number`);--> statement-breakpoint
CREATE TABLE `rule_sets` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`code` text NOT NULL,
	`edition` text NOT NULL,
	`description` text DEFAULT '' NOT NULL,
	`draft_revision` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `rule_sets_name_unique` ON `rule_sets` (`name`);--> statement-breakpoint
CREATE TABLE `rulebook_state` (
	`id` integer PRIMARY KEY NOT NULL,
	`generation` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `zone_map_counties` (
	`zone_map_id` integer NOT NULL,
	`county_fips` text NOT NULL,
	`zone` text NOT NULL,
	`county_name` text,
	`state_code` text,
	PRIMARY KEY(`zone_map_id`, `county_fips`),
	FOREIGN KEY (`zone_map_id`) REFERENCES `zone_maps`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `zone_maps` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`edition` text DEFAULT '' NOT NULL,
	`source` text DEFAULT '' NOT NULL,
	`revision` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `zone_maps_name_unique` ON `zone_maps` (`name`);--> statement-breakpoint
ALTER TABLE `jurisdictions` ADD `zone_map_id` integer REFERENCES zone_maps(id);--> statement-breakpoint
ALTER TABLE `jurisdictions` ADD `notes` text DEFAULT '' NOT NULL;--> statement-breakpoint
CREATE INDEX `jurisdictions_zone_map_idx` ON `jurisdictions` (`zone_map_id`);