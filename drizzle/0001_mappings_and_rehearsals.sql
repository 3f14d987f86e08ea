CREATE TABLE `mapping` (
	`id` text PRIMARY KEY NOT NULL,
	`owner_id` text NOT NULL,
	`name` text NOT NULL,
	`visibility` text DEFAULT 'private' NOT NULL,
	`demo_slug` text,
	`current_version` integer DEFAULT 1 NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`owner_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `mapping_demoSlug_unique` ON `mapping` (`demo_slug`);--> statement-breakpoint
CREATE INDEX `mapping_owner_idx` ON `mapping` (`owner_id`);--> statement-breakpoint
CREATE TABLE `mapping_version` (
	`id` text PRIMARY KEY NOT NULL,
	`mapping_id` text NOT NULL,
	`version` integer NOT NULL,
	`document` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`mapping_id`) REFERENCES `mapping`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `mapping_version_idx` ON `mapping_version` (`mapping_id`,`version`);--> statement-breakpoint
CREATE TABLE `rehearsal` (
	`id` text PRIMARY KEY NOT NULL,
	`owner_id` text NOT NULL,
	`mapping_id` text,
	`mapping_version_id` text,
	`mapping_name` text NOT NULL,
	`name` text NOT NULL,
	`tempo` real NOT NULL,
	`started_at` text NOT NULL,
	`status` text DEFAULT 'recording' NOT NULL,
	`event_count` integer DEFAULT 0 NOT NULL,
	`duration_ms` real DEFAULT 0 NOT NULL,
	`finding_count` integer DEFAULT 0 NOT NULL,
	`audio_file` text,
	`audio_type` text,
	`audio_bytes` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`owner_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`mapping_id`) REFERENCES `mapping`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`mapping_version_id`) REFERENCES `mapping_version`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `rehearsal_owner_idx` ON `rehearsal` (`owner_id`);--> statement-breakpoint
CREATE TABLE `rehearsal_chunk` (
	`rehearsal_id` text NOT NULL,
	`seq` integer NOT NULL,
	`events` text NOT NULL,
	`event_count` integer NOT NULL,
	`received_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	PRIMARY KEY(`rehearsal_id`, `seq`),
	FOREIGN KEY (`rehearsal_id`) REFERENCES `rehearsal`(`id`) ON UPDATE no action ON DELETE cascade
);
