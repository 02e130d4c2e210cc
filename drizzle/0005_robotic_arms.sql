ALTER TABLE `stations` ADD `arms_json` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `tasks` ADD `arm_json` text;