CREATE TABLE `plan_station_notices` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`plan_id` integer NOT NULL,
	`station_id` integer NOT NULL,
	`station_version` integer NOT NULL,
	`plan_status` text NOT NULL,
	`user_id` integer,
	`summary` text NOT NULL,
	`touches_json` text NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`plan_id`) REFERENCES `plans`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`station_id`) REFERENCES `stations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `plan_station_notices_plan_idx` ON `plan_station_notices` (`plan_id`);--> statement-breakpoint
CREATE TABLE `series` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`title` text NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`author_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE TABLE `series_plans` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`series_id` integer NOT NULL,
	`plan_id` integer NOT NULL,
	`ord` integer NOT NULL,
	FOREIGN KEY (`series_id`) REFERENCES `series`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`plan_id`) REFERENCES `plans`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `series_plans_plan` ON `series_plans` (`plan_id`);--> statement-breakpoint
CREATE INDEX `series_plans_series_idx` ON `series_plans` (`series_id`);--> statement-breakpoint
CREATE TABLE `station_versions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`station_id` integer NOT NULL,
	`version` integer NOT NULL,
	`action` text NOT NULL,
	`user_id` integer,
	`change_json` text NOT NULL,
	`summary_json` text DEFAULT '[]' NOT NULL,
	`snapshot_json` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`station_id`) REFERENCES `stations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `station_versions_station_version` ON `station_versions` (`station_id`,`version`);--> statement-breakpoint
ALTER TABLE `plans` ADD `submitted_station_version` integer;--> statement-breakpoint
ALTER TABLE `plans` ADD `approved_station_version` integer;--> statement-breakpoint
-- Plans already in review or approved were checked against the station as it is now: they pin
-- its current version (the version history itself starts at that version, written at start-up).
UPDATE `plans` SET `submitted_station_version` = (SELECT s."version" FROM `stations` s WHERE s."id" = `plans`."station_id")
WHERE `status` IN ('in-review', 'approved');--> statement-breakpoint
UPDATE `plans` SET `approved_station_version` = (SELECT s."version" FROM `stations` s WHERE s."id" = `plans`."station_id")
WHERE `status` = 'approved';
