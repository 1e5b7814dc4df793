CREATE TABLE `account_token` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`email` text NOT NULL,
	`purpose` text NOT NULL,
	`token_hash` text NOT NULL,
	`name` text,
	`password_hash` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer
);
--> statement-breakpoint
CREATE UNIQUE INDEX `account_token_token_hash_unique` ON `account_token` (`token_hash`);--> statement-breakpoint
CREATE INDEX `account_token_email` ON `account_token` (`email`);--> statement-breakpoint
CREATE TABLE `revoked_session` (
	`sid` text PRIMARY KEY NOT NULL,
	`expires_at` integer NOT NULL
);
--> statement-breakpoint
DROP INDEX `mail_outbox_status`;--> statement-breakpoint
ALTER TABLE `mail_outbox` ADD `next_attempt_at` integer;--> statement-breakpoint
ALTER TABLE `mail_outbox` ADD `give_up_at` integer;--> statement-breakpoint
ALTER TABLE `mail_outbox` ADD `project_id` integer;--> statement-breakpoint
ALTER TABLE `mail_outbox` ADD `kind` text DEFAULT 'other' NOT NULL;--> statement-breakpoint
CREATE INDEX `mail_outbox_project` ON `mail_outbox` (`project_id`);--> statement-breakpoint
CREATE INDEX `mail_outbox_status` ON `mail_outbox` (`status`,`next_attempt_at`);--> statement-breakpoint
ALTER TABLE `user` ADD `session_generation` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
-- hand-written below
-- Mail the old outbox had marked failed was still meant to be retried: give it the new 48-hour schedule.
UPDATE `mail_outbox` SET `status` = 'pending', `next_attempt_at` = (unixepoch('subsec') * 1000), `give_up_at` = (unixepoch('subsec') * 1000) + 172800000 WHERE `status` IN ('pending', 'failed');
