CREATE TABLE `mail_quota` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`recipient` varchar(254) NOT NULL,
	`kind` varchar(40) NOT NULL,
	`hour_start` datetime(3) NOT NULL,
	`sent` int NOT NULL DEFAULT 0,
	CONSTRAINT `mail_quota_id` PRIMARY KEY(`id`),
	CONSTRAINT `mail_quota_key_unique` UNIQUE(`recipient`,`kind`,`hour_start`)
);
--> statement-breakpoint
CREATE TABLE `sign_in_throttles` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`email` varchar(254) NOT NULL,
	`address` varchar(64) NOT NULL,
	`attempts` int NOT NULL DEFAULT 0,
	`next_attempt_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `sign_in_throttles_id` PRIMARY KEY(`id`),
	CONSTRAINT `sign_in_throttles_pair_unique` UNIQUE(`email`,`address`)
);
--> statement-breakpoint
CREATE TABLE `user_sessions` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`user_id` bigint unsigned NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`device` varchar(60) NOT NULL,
	`last_seen_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`revoked_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `user_sessions_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_sessions_token_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
ALTER TABLE `user_sessions` ADD CONSTRAINT `user_sessions_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `mail_quota_hour_idx` ON `mail_quota` (`hour_start`);--> statement-breakpoint
CREATE INDEX `sign_in_throttles_updated_idx` ON `sign_in_throttles` (`updated_at`);--> statement-breakpoint
CREATE INDEX `user_sessions_user_idx` ON `user_sessions` (`user_id`,`revoked_at`);