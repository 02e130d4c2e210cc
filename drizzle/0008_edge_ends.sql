DROP INDEX `edges_station_idx`;--> statement-breakpoint
CREATE INDEX `edges_station_ord_idx` ON `edges` (`station_id`,`ord`);--> statement-breakpoint
CREATE INDEX `edges_station_from_idx` ON `edges` (`station_id`,`from_key`);--> statement-breakpoint
CREATE INDEX `edges_station_to_idx` ON `edges` (`station_id`,`to_key`);