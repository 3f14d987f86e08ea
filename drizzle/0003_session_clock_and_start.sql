ALTER TABLE `rehearsal` ADD `clock` text;--> statement-breakpoint
ALTER TABLE `rehearsal` ADD `initial` text;