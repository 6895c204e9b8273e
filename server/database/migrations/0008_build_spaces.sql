CREATE TABLE `build_members` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`user_id` bigint unsigned NOT NULL,
	`rig_id` bigint unsigned,
	`join_code_id` bigint unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `build_members_id` PRIMARY KEY(`id`),
	CONSTRAINT `build_members_order_user_unique` UNIQUE(`order_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `join_codes` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`code` varchar(16) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`max_uses` int,
	`uses` int NOT NULL DEFAULT 0,
	`revoked_at` datetime(3),
	`created_by_id` bigint unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `join_codes_id` PRIMARY KEY(`id`),
	CONSTRAINT `join_codes_code_unique` UNIQUE(`code`)
);
--> statement-breakpoint
CREATE TABLE `rig_steps` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`rig_id` bigint unsigned NOT NULL,
	`step` enum('frame','linkage','wiring','rail-sensor','calibration','tuning','nudge-test') NOT NULL,
	`done_at` datetime(3),
	`done_by_id` bigint unsigned,
	`note` varchar(300),
	`updated_by_id` bigint unsigned,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `rig_steps_id` PRIMARY KEY(`id`),
	CONSTRAINT `rig_steps_rig_step_unique` UNIQUE(`rig_id`,`step`)
);
--> statement-breakpoint
CREATE TABLE `rigs` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`serial` varchar(40) NOT NULL,
	`name` varchar(60),
	`group_label` varchar(40),
	`retired_at` datetime(3),
	`dimensions` json,
	`dimensions_updated_at` datetime(3),
	`calibration` json,
	`calibrated_at` datetime(3),
	`last_activity_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `rigs_id` PRIMARY KEY(`id`),
	CONSTRAINT `rigs_serial_unique` UNIQUE(`serial`)
);
--> statement-breakpoint
ALTER TABLE `users` MODIFY COLUMN `email` varchar(254);--> statement-breakpoint
ALTER TABLE `tuning_sheets` ADD `verdict` enum('balances','slow','oscillates','drifts','runs-away');--> statement-breakpoint
ALTER TABLE `tuning_sheets` ADD `measured` json;--> statement-breakpoint
ALTER TABLE `users` ADD `username` varchar(40);--> statement-breakpoint
ALTER TABLE `users` ADD CONSTRAINT `users_username_unique` UNIQUE(`username`);--> statement-breakpoint
ALTER TABLE `build_members` ADD CONSTRAINT `build_members_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `build_members` ADD CONSTRAINT `build_members_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `join_codes` ADD CONSTRAINT `join_codes_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `join_codes` ADD CONSTRAINT `join_codes_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `rig_steps` ADD CONSTRAINT `rig_steps_rig_id_rigs_id_fk` FOREIGN KEY (`rig_id`) REFERENCES `rigs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `rigs` ADD CONSTRAINT `rigs_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `build_members_user_idx` ON `build_members` (`user_id`);--> statement-breakpoint
CREATE INDEX `build_members_rig_idx` ON `build_members` (`rig_id`);--> statement-breakpoint
CREATE INDEX `join_codes_order_idx` ON `join_codes` (`order_id`);--> statement-breakpoint
CREATE INDEX `rigs_order_idx` ON `rigs` (`order_id`);