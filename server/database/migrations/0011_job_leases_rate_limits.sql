CREATE TABLE `rate_limit_hits` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`bucket` varchar(40) NOT NULL,
	`address` varchar(64) NOT NULL,
	`window_no` bigint unsigned NOT NULL,
	`hits` int NOT NULL DEFAULT 0,
	`expires_at` datetime(3) NOT NULL,
	CONSTRAINT `rate_limit_hits_id` PRIMARY KEY(`id`),
	CONSTRAINT `rate_limit_hits_key` UNIQUE(`bucket`,`address`,`window_no`)
);
--> statement-breakpoint
ALTER TABLE `jobs` ADD `claimed_by` varchar(64);--> statement-breakpoint
ALTER TABLE `jobs` ADD `lease_until` datetime(3);--> statement-breakpoint
CREATE INDEX `rate_limit_hits_expires_idx` ON `rate_limit_hits` (`expires_at`);