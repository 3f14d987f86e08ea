ALTER TABLE `mapping` ADD `deleted_at` integer;--> statement-breakpoint
ALTER TABLE `rehearsal` ADD `deleted_at` integer;