CREATE TABLE `mapping_version_v1` (
	`version_id` text PRIMARY KEY NOT NULL,
	`document` text NOT NULL,
	`archived_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`version_id`) REFERENCES `mapping_version`(`id`) ON UPDATE no action ON DELETE cascade
);
