CREATE TABLE `revoked_sessions` (
	`token_hash` text PRIMARY KEY NOT NULL,
	`expires_at` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `revoked_sessions_expires_idx` ON `revoked_sessions` (`expires_at`);