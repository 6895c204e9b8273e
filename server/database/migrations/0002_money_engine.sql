CREATE TABLE `jobs` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`kind` varchar(40) NOT NULL,
	`payload` json NOT NULL,
	`unique_key` varchar(120),
	`state` enum('pending','done','failed') NOT NULL DEFAULT 'pending',
	`attempts` int NOT NULL DEFAULT 0,
	`next_attempt_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_error` varchar(500),
	`done_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `jobs_id` PRIMARY KEY(`id`),
	CONSTRAINT `jobs_unique_key` UNIQUE(`unique_key`)
);
--> statement-breakpoint
ALTER TABLE `orders` MODIFY COLUMN `status` enum('placed','po review','awaiting payment','paid','shipped','delivered','cancelled','rejected') NOT NULL;--> statement-breakpoint
UPDATE `orders` SET `status` = 'awaiting payment' WHERE `status` = 'placed';--> statement-breakpoint
UPDATE `orders` `o` JOIN `purchase_orders` `p` ON `p`.`order_id` = `o`.`id` SET `o`.`status` = 'rejected' WHERE `p`.`status` = 'rejected' AND `o`.`status` = 'cancelled';--> statement-breakpoint
ALTER TABLE `orders` MODIFY COLUMN `status` enum('po review','awaiting payment','paid','shipped','delivered','cancelled','rejected') NOT NULL;--> statement-breakpoint
ALTER TABLE `orders` ADD `payment_intent_id` varchar(80);--> statement-breakpoint
ALTER TABLE `orders` ADD `refunded_at` datetime(3);--> statement-breakpoint
ALTER TABLE `orders` ADD `refund_reference` varchar(80);--> statement-breakpoint
ALTER TABLE `orders` ADD `invoice_voided_at` datetime(3);--> statement-breakpoint
CREATE INDEX `jobs_due_idx` ON `jobs` (`state`,`next_attempt_at`);--> statement-breakpoint
CREATE INDEX `jobs_kind_idx` ON `jobs` (`kind`,`created_at`);