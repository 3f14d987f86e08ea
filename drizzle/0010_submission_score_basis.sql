ALTER TABLE `submission` ADD `zero` real;--> statement-breakpoint
ALTER TABLE `submission` ADD `drill_document` text;--> statement-breakpoint
ALTER TABLE `submission` ADD `mapping_version_id` text;