PRAGMA foreign_keys=OFF;--> statement-breakpoint
CREATE TABLE `__new_manifest_items` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`plan_id` integer NOT NULL,
	`ord` integer NOT NULL,
	`key` text NOT NULL,
	`name` text NOT NULL,
	`kind` text NOT NULL,
	`quantity` integer DEFAULT 1 NOT NULL,
	`carried_by` text,
	`starts_at` text NOT NULL,
	`installed_at` text,
	`ends_at` text,
	`leave_outside` integer DEFAULT false NOT NULL,
	`notes` text,
	FOREIGN KEY (`plan_id`) REFERENCES `plans`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
-- Every item gets a plan-unique key. An item that used to end at a node other than the airlock was
-- stowed outside: it is marked to stay outside, and the carrier's last task sets it down there (below).
INSERT INTO `__new_manifest_items`("id", "plan_id", "ord", "key", "name", "kind", "quantity", "carried_by", "starts_at", "installed_at", "ends_at", "leave_outside", "notes")
SELECT m."id", m."plan_id", m."ord", 'item-' || (m."ord" + 1), m."name", m."kind", m."quantity", m."carried_by", m."starts_at", NULL, m."ends_at",
  CASE WHEN m."ends_at" IS NOT NULL AND m."ends_at" <> 'airlock' AND m."ends_at" NOT IN (
    SELECT n."key" FROM `nodes` n JOIN `plans` p ON p."station_id" = n."station_id" WHERE p."id" = m."plan_id" AND n."kind" = 'airlock'
  ) THEN 1 ELSE 0 END,
  m."notes"
FROM `manifest_items` m;--> statement-breakpoint
DROP TABLE `manifest_items`;--> statement-breakpoint
ALTER TABLE `__new_manifest_items` RENAME TO `manifest_items`;--> statement-breakpoint
PRAGMA foreign_keys=ON;--> statement-breakpoint
CREATE INDEX `manifest_items_plan_idx` ON `manifest_items` (`plan_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `manifest_items_plan_key` ON `manifest_items` (`plan_id`,`key`);--> statement-breakpoint
ALTER TABLE `tasks` ADD `sockets_json` text;--> statement-breakpoint
ALTER TABLE `tasks` ADD `actions_json` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
UPDATE `tasks` SET `actions_json` = (
  SELECT json_group_array(json_object('do', 'set-down', 'item', m."key", 'by', m."carried_by", 'at', m."ends_at"))
  FROM `manifest_items` m
  WHERE m."leave_outside" = 1 AND m."plan_id" = `tasks`."plan_id" AND `tasks`."id" = (
    SELECT t2."id" FROM `tasks` t2 WHERE t2."plan_id" = m."plan_id" AND (t2."crew" = m."carried_by" OR t2."crew" = 'both')
    ORDER BY t2."ord" DESC LIMIT 1
  )
)
WHERE EXISTS (
  SELECT 1 FROM `manifest_items` m
  WHERE m."leave_outside" = 1 AND m."plan_id" = `tasks`."plan_id" AND `tasks`."id" = (
    SELECT t2."id" FROM `tasks` t2 WHERE t2."plan_id" = m."plan_id" AND (t2."crew" = m."carried_by" OR t2."crew" = 'both')
    ORDER BY t2."ord" DESC LIMIT 1
  )
);--> statement-breakpoint
-- A task for both names one restraint per person: the old shared socket becomes EV1's.
UPDATE `tasks` SET `sockets_json` = json_object('EV1', `socket_key`), `socket_key` = NULL
WHERE `crew` = 'both' AND `socket_key` IS NOT NULL;