ALTER TABLE `tasks` ADD `after_json` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `tasks` ADD `optional` integer DEFAULT false NOT NULL;