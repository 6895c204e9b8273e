CREATE TABLE `batches` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`product_id` bigint unsigned NOT NULL,
	`code` varchar(40) NOT NULL,
	`quantity_built` int NOT NULL,
	`reserved` int NOT NULL DEFAULT 0,
	`built_on` datetime(3) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `batches_id` PRIMARY KEY(`id`),
	CONSTRAINT `batches_code_unique` UNIQUE(`code`)
);
--> statement-breakpoint
CREATE TABLE `fake_payment_objects` (
	`id` varchar(80) NOT NULL,
	`type` varchar(40) NOT NULL,
	`data` json NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `fake_payment_objects_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `order_events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`kind` varchar(40) NOT NULL,
	`message` varchar(500) NOT NULL,
	`actor_id` bigint unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `order_events_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `order_lines` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`product_id` bigint unsigned NOT NULL,
	`name` varchar(120) NOT NULL,
	`quantity` int NOT NULL,
	`tier_min_quantity` int NOT NULL,
	`unit_price_cents` int NOT NULL,
	`line_total_cents` int NOT NULL,
	CONSTRAINT `order_lines_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `orders` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`number` varchar(20),
	`school_id` bigint unsigned NOT NULL,
	`placed_by_id` bigint unsigned NOT NULL,
	`quote_id` bigint unsigned,
	`status` enum('placed','po review','awaiting payment','paid','shipped','delivered','cancelled') NOT NULL DEFAULT 'placed',
	`payment_method` enum('card','purchase-order') NOT NULL,
	`subtotal_cents` int NOT NULL,
	`shipping_cents` int NOT NULL,
	`tax_cents` int NOT NULL,
	`total_cents` int NOT NULL,
	`tax_exempt` boolean NOT NULL,
	`provider_customer_id` varchar(80),
	`checkout_session_id` varchar(80),
	`checkout_url` varchar(500),
	`invoice_id` varchar(80),
	`invoice_number` varchar(40),
	`invoice_url` varchar(500),
	`invoice_due_at` datetime(3),
	`paid_at` datetime(3),
	`payment_reference` varchar(120),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `orders_id` PRIMARY KEY(`id`),
	CONSTRAINT `orders_number_unique` UNIQUE(`number`),
	CONSTRAINT `orders_session_unique` UNIQUE(`checkout_session_id`),
	CONSTRAINT `orders_invoice_unique` UNIQUE(`invoice_id`)
);
--> statement-breakpoint
CREATE TABLE `payment_events` (
	`id` varchar(80) NOT NULL,
	`type` varchar(80) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `payment_events_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `price_tiers` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`product_id` bigint unsigned NOT NULL,
	`min_quantity` int NOT NULL,
	`unit_price_cents` int NOT NULL,
	CONSTRAINT `price_tiers_id` PRIMARY KEY(`id`),
	CONSTRAINT `price_tiers_product_min_unique` UNIQUE(`product_id`,`min_quantity`)
);
--> statement-breakpoint
CREATE TABLE `products` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`slug` varchar(80) NOT NULL,
	`name` varchar(120) NOT NULL,
	`kind` enum('kit','part') NOT NULL,
	`summary` varchar(300) NOT NULL,
	`description` text NOT NULL,
	`specs` json NOT NULL,
	`image` varchar(200) NOT NULL,
	`weight_grams` int NOT NULL,
	`active` boolean NOT NULL DEFAULT true,
	`sort_order` int NOT NULL DEFAULT 0,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `products_id` PRIMARY KEY(`id`),
	CONSTRAINT `products_slug_unique` UNIQUE(`slug`)
);
--> statement-breakpoint
CREATE TABLE `purchase_orders` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`po_number` varchar(60) NOT NULL,
	`ap_email` varchar(254) NOT NULL,
	`status` enum('review','approved','rejected') NOT NULL DEFAULT 'review',
	`reject_reason` varchar(500),
	`reviewed_by_id` bigint unsigned,
	`reviewed_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `purchase_orders_id` PRIMARY KEY(`id`),
	CONSTRAINT `purchase_orders_order_unique` UNIQUE(`order_id`)
);
--> statement-breakpoint
CREATE TABLE `quote_lines` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`quote_id` bigint unsigned NOT NULL,
	`product_id` bigint unsigned NOT NULL,
	`name` varchar(120) NOT NULL,
	`quantity` int NOT NULL,
	`tier_min_quantity` int NOT NULL,
	`unit_price_cents` int NOT NULL,
	`line_total_cents` int NOT NULL,
	CONSTRAINT `quote_lines_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `quotes` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`number` varchar(20),
	`school_id` bigint unsigned NOT NULL,
	`created_by_id` bigint unsigned NOT NULL,
	`subtotal_cents` int NOT NULL,
	`shipping_cents` int NOT NULL,
	`tax_cents` int NOT NULL,
	`total_cents` int NOT NULL,
	`tax_rate_bp` int NOT NULL,
	`tax_exempt` boolean NOT NULL,
	`valid_until` datetime(3) NOT NULL,
	`order_id` bigint unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `quotes_id` PRIMARY KEY(`id`),
	CONSTRAINT `quotes_number_unique` UNIQUE(`number`),
	CONSTRAINT `quotes_order_unique` UNIQUE(`order_id`)
);
--> statement-breakpoint
CREATE TABLE `shipments` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`carrier` varchar(60) NOT NULL,
	`tracking` varchar(80) NOT NULL,
	`created_by_id` bigint unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `shipments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `stock_reservations` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`order_id` bigint unsigned NOT NULL,
	`product_id` bigint unsigned NOT NULL,
	`batch_id` bigint unsigned NOT NULL,
	`quantity` int NOT NULL,
	`status` enum('reserved','allocated','released') NOT NULL DEFAULT 'reserved',
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `stock_reservations_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `stored_files` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`kind` enum('purchase-order','tax-certificate') NOT NULL,
	`school_id` bigint unsigned NOT NULL,
	`order_id` bigint unsigned,
	`storage_key` varchar(120) NOT NULL,
	`filename` varchar(200) NOT NULL,
	`content_type` varchar(80) NOT NULL,
	`size` int NOT NULL,
	`uploaded_by_id` bigint unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `stored_files_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `batches` ADD CONSTRAINT `batches_product_id_products_id_fk` FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `order_events` ADD CONSTRAINT `order_events_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `order_lines` ADD CONSTRAINT `order_lines_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `order_lines` ADD CONSTRAINT `order_lines_product_id_products_id_fk` FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `orders` ADD CONSTRAINT `orders_school_id_schools_id_fk` FOREIGN KEY (`school_id`) REFERENCES `schools`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `orders` ADD CONSTRAINT `orders_placed_by_id_users_id_fk` FOREIGN KEY (`placed_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `price_tiers` ADD CONSTRAINT `price_tiers_product_id_products_id_fk` FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `purchase_orders` ADD CONSTRAINT `purchase_orders_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quote_lines` ADD CONSTRAINT `quote_lines_quote_id_quotes_id_fk` FOREIGN KEY (`quote_id`) REFERENCES `quotes`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quote_lines` ADD CONSTRAINT `quote_lines_product_id_products_id_fk` FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quotes` ADD CONSTRAINT `quotes_school_id_schools_id_fk` FOREIGN KEY (`school_id`) REFERENCES `schools`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quotes` ADD CONSTRAINT `quotes_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `shipments` ADD CONSTRAINT `shipments_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `shipments` ADD CONSTRAINT `shipments_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `stock_reservations` ADD CONSTRAINT `stock_reservations_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `stock_reservations` ADD CONSTRAINT `stock_reservations_product_id_products_id_fk` FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `stock_reservations` ADD CONSTRAINT `stock_reservations_batch_id_batches_id_fk` FOREIGN KEY (`batch_id`) REFERENCES `batches`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `stored_files` ADD CONSTRAINT `stored_files_school_id_schools_id_fk` FOREIGN KEY (`school_id`) REFERENCES `schools`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `stored_files` ADD CONSTRAINT `stored_files_uploaded_by_id_users_id_fk` FOREIGN KEY (`uploaded_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `batches_product_idx` ON `batches` (`product_id`,`built_on`);--> statement-breakpoint
CREATE INDEX `fake_payment_objects_type_idx` ON `fake_payment_objects` (`type`,`created_at`);--> statement-breakpoint
CREATE INDEX `order_events_order_idx` ON `order_events` (`order_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `order_lines_order_idx` ON `order_lines` (`order_id`);--> statement-breakpoint
CREATE INDEX `orders_school_idx` ON `orders` (`school_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `orders_status_idx` ON `orders` (`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `quote_lines_quote_idx` ON `quote_lines` (`quote_id`);--> statement-breakpoint
CREATE INDEX `quotes_school_idx` ON `quotes` (`school_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `shipments_order_idx` ON `shipments` (`order_id`);--> statement-breakpoint
CREATE INDEX `stock_reservations_order_idx` ON `stock_reservations` (`order_id`);--> statement-breakpoint
CREATE INDEX `stock_reservations_batch_idx` ON `stock_reservations` (`batch_id`);--> statement-breakpoint
CREATE INDEX `stored_files_order_idx` ON `stored_files` (`order_id`);--> statement-breakpoint
CREATE INDEX `stored_files_school_idx` ON `stored_files` (`school_id`,`kind`);