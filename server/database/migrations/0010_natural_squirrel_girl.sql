CREATE INDEX `tickets_created_idx` ON `tickets` (`created_at`);--> statement-breakpoint
CREATE INDEX `tickets_created_desc_idx` ON `tickets` (`created_at` desc);--> statement-breakpoint
CREATE INDEX `tickets_activity_desc_idx` ON `tickets` (`last_message_at` desc);--> statement-breakpoint
CREATE INDEX `tickets_status_created_idx` ON `tickets` (`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `tickets_status_activity_desc_idx` ON `tickets` (`status`,`last_message_at` desc);--> statement-breakpoint
CREATE INDEX `tickets_priority_created_idx` ON `tickets` (`priority`,`created_at`);--> statement-breakpoint
CREATE INDEX `tickets_assignee_priority_desc_idx` ON `tickets` (`assignee_id`,`priority` desc);