CREATE TABLE `auth_throttle` (
	`bucket` text PRIMARY KEY NOT NULL,
	`hits` integer NOT NULL,
	`window_started_at` integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE `session` ADD `impersonated_by` text;--> statement-breakpoint
ALTER TABLE `user` ADD `banned` integer DEFAULT false;--> statement-breakpoint
ALTER TABLE `user` ADD `ban_reason` text;--> statement-breakpoint
ALTER TABLE `user` ADD `ban_expires` integer;