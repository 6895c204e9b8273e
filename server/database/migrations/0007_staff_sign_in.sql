ALTER TABLE `users` ADD `last_sign_in_at` datetime(3);--> statement-breakpoint
UPDATE `users` SET `last_sign_in_at` = (SELECT MAX(`created_at`) FROM `user_sessions` WHERE `user_sessions`.`user_id` = `users`.`id`);
