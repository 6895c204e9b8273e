INSERT INTO `jobs` (`kind`, `payload`, `attempts`, `next_attempt_at`, `created_at`)
SELECT 'mail', JSON_OBJECT('kind', `kind`, 'to', `to_address`, 'subject', `subject`, 'text', `text_body`,
  'html', `html_body`, 'attachments', COALESCE(`attachments`, JSON_ARRAY())), `attempts`, `next_attempt_at`, `created_at`
FROM `email_outbox` WHERE `status` = 'pending';--> statement-breakpoint
DROP TABLE `email_outbox`;
