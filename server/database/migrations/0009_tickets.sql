CREATE TABLE `shipment_items` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`shipment_id` bigint unsigned NOT NULL,
	`product_id` bigint unsigned NOT NULL,
	`quantity` int NOT NULL,
	CONSTRAINT `shipment_items_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `stock_replies` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`title` varchar(80) NOT NULL,
	`body` text NOT NULL,
	`created_by_id` bigint unsigned NOT NULL,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`archived_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `stock_replies_id` PRIMARY KEY(`id`),
	CONSTRAINT `stock_replies_title_unique` UNIQUE(`title`)
);
--> statement-breakpoint
CREATE TABLE `ticket_attachments` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`ticket_id` bigint unsigned,
	`message_id` bigint unsigned,
	`kind` enum('image','video','pdf') NOT NULL,
	`storage_key` varchar(120) NOT NULL,
	`filename` varchar(200) NOT NULL,
	`content_type` varchar(80) NOT NULL,
	`size` int NOT NULL,
	`width` int,
	`height` int,
	`uploaded_by_id` bigint unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `ticket_attachments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `ticket_messages` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`ticket_id` bigint unsigned NOT NULL,
	`author_id` bigint unsigned NOT NULL,
	`internal` boolean NOT NULL DEFAULT false,
	`body` text NOT NULL,
	`sheet_id` bigint unsigned,
	`stock_reply_id` bigint unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `ticket_messages_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `tickets` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`school_id` bigint unsigned NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`rig_id` bigint unsigned,
	`subject` varchar(120) NOT NULL,
	`status` enum('needs reply','awaiting builder','resolved') NOT NULL DEFAULT 'needs reply',
	`priority` enum('low','normal','urgent') NOT NULL DEFAULT 'normal',
	`assignee_id` bigint unsigned,
	`opened_by_id` bigint unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_message_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`status_changed_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`resolved_at` datetime(3),
	CONSTRAINT `tickets_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `stock_reservations` MODIFY COLUMN `status` enum('reserved','allocated','released','sent') NOT NULL DEFAULT 'reserved';--> statement-breakpoint
ALTER TABLE `shipments` ADD `kind` enum('order','replacement') DEFAULT 'order' NOT NULL;--> statement-breakpoint
ALTER TABLE `shipments` ADD `ticket_id` bigint unsigned;--> statement-breakpoint
ALTER TABLE `stock_reservations` ADD `shipment_id` bigint unsigned;--> statement-breakpoint
ALTER TABLE `shipment_items` ADD CONSTRAINT `shipment_items_shipment_id_shipments_id_fk` FOREIGN KEY (`shipment_id`) REFERENCES `shipments`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `shipment_items` ADD CONSTRAINT `shipment_items_product_id_products_id_fk` FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `stock_replies` ADD CONSTRAINT `stock_replies_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `ticket_attachments` ADD CONSTRAINT `ticket_attachments_uploaded_by_id_users_id_fk` FOREIGN KEY (`uploaded_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `ticket_messages` ADD CONSTRAINT `ticket_messages_ticket_id_tickets_id_fk` FOREIGN KEY (`ticket_id`) REFERENCES `tickets`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `ticket_messages` ADD CONSTRAINT `ticket_messages_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tickets` ADD CONSTRAINT `tickets_school_id_schools_id_fk` FOREIGN KEY (`school_id`) REFERENCES `schools`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tickets` ADD CONSTRAINT `tickets_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tickets` ADD CONSTRAINT `tickets_opened_by_id_users_id_fk` FOREIGN KEY (`opened_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `shipment_items_shipment_idx` ON `shipment_items` (`shipment_id`);--> statement-breakpoint
CREATE INDEX `ticket_attachments_message_idx` ON `ticket_attachments` (`message_id`);--> statement-breakpoint
CREATE INDEX `ticket_attachments_uploader_idx` ON `ticket_attachments` (`uploaded_by_id`,`message_id`);--> statement-breakpoint
CREATE INDEX `ticket_messages_ticket_idx` ON `ticket_messages` (`ticket_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `tickets_school_idx` ON `tickets` (`school_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `tickets_order_idx` ON `tickets` (`order_id`);--> statement-breakpoint
CREATE INDEX `tickets_rig_idx` ON `tickets` (`rig_id`);--> statement-breakpoint
CREATE INDEX `tickets_queue_idx` ON `tickets` (`status`,`priority`,`created_at`);--> statement-breakpoint
CREATE INDEX `tickets_assignee_idx` ON `tickets` (`assignee_id`,`status`);--> statement-breakpoint
CREATE INDEX `shipments_ticket_idx` ON `shipments` (`ticket_id`);