ALTER TABLE `quotes` MODIFY COLUMN `tax_rate_bp` decimal(7,1) NOT NULL DEFAULT 725;--> statement-breakpoint
ALTER TABLE `order_lines` ADD `tier_label` varchar(30);--> statement-breakpoint
ALTER TABLE `orders` ADD `tax_rate_bp` decimal(7,1) DEFAULT 725 NOT NULL;--> statement-breakpoint
ALTER TABLE `orders` ADD `tax_state` varchar(2);--> statement-breakpoint
ALTER TABLE `orders` ADD `ship_to` json;--> statement-breakpoint
ALTER TABLE `orders` ADD `bill_to` json;--> statement-breakpoint
ALTER TABLE `orders` ADD `delivery_note` varchar(200);--> statement-breakpoint
ALTER TABLE `quote_lines` ADD `tier_label` varchar(30);--> statement-breakpoint
ALTER TABLE `quotes` ADD `tax_state` varchar(2);