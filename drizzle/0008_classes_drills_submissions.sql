CREATE TABLE `assignment` (
	`id` text PRIMARY KEY NOT NULL,
	`class_id` text NOT NULL,
	`drill_id` text NOT NULL,
	`due_at` integer NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`class_id`) REFERENCES `school_class`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`drill_id`) REFERENCES `drill`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `assignment_class_idx` ON `assignment` (`class_id`);--> statement-breakpoint
CREATE TABLE `class_invite` (
	`token` text PRIMARY KEY NOT NULL,
	`class_id` text NOT NULL,
	`email` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`accepted_at` integer,
	`accepted_by` text,
	FOREIGN KEY (`class_id`) REFERENCES `school_class`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`accepted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE TABLE `class_mapping` (
	`class_id` text NOT NULL,
	`mapping_id` text NOT NULL,
	`shared_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	PRIMARY KEY(`class_id`, `mapping_id`),
	FOREIGN KEY (`class_id`) REFERENCES `school_class`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`mapping_id`) REFERENCES `mapping`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `class_member` (
	`class_id` text NOT NULL,
	`user_id` text NOT NULL,
	`joined_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	PRIMARY KEY(`class_id`, `user_id`),
	FOREIGN KEY (`class_id`) REFERENCES `school_class`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `class_member_user_idx` ON `class_member` (`user_id`);--> statement-breakpoint
CREATE TABLE `drill` (
	`id` text PRIMARY KEY NOT NULL,
	`owner_id` text NOT NULL,
	`mapping_id` text NOT NULL,
	`mapping_version_id` text NOT NULL,
	`name` text NOT NULL,
	`document` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`owner_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`mapping_id`) REFERENCES `mapping`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`mapping_version_id`) REFERENCES `mapping_version`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `drill_owner_idx` ON `drill` (`owner_id`);--> statement-breakpoint
CREATE TABLE `drill_take` (
	`rehearsal_id` text PRIMARY KEY NOT NULL,
	`drill_id` text NOT NULL,
	`user_id` text NOT NULL,
	`zero` real NOT NULL,
	`score` text NOT NULL,
	`hit_rate` real NOT NULL,
	`pass` integer NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`rehearsal_id`) REFERENCES `rehearsal`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`drill_id`) REFERENCES `drill`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `drill_take_user_idx` ON `drill_take` (`user_id`,`drill_id`);--> statement-breakpoint
CREATE TABLE `school_class` (
	`id` text PRIMARY KEY NOT NULL,
	`teacher_id` text NOT NULL,
	`name` text NOT NULL,
	`join_code` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`teacher_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `school_class_joinCode_unique` ON `school_class` (`join_code`);--> statement-breakpoint
CREATE INDEX `school_class_teacher_idx` ON `school_class` (`teacher_id`);--> statement-breakpoint
CREATE TABLE `submission` (
	`id` text PRIMARY KEY NOT NULL,
	`assignment_id` text NOT NULL,
	`student_id` text NOT NULL,
	`rehearsal_id` text NOT NULL,
	`submitted_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`late` integer NOT NULL,
	`score` text NOT NULL,
	`hit_rate` real NOT NULL,
	`pass` integer NOT NULL,
	`audio_file` text,
	`audio_type` text,
	`grade` text,
	`comment` text,
	`graded_at` integer,
	FOREIGN KEY (`assignment_id`) REFERENCES `assignment`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`student_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`rehearsal_id`) REFERENCES `rehearsal`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `submission_assignment_idx` ON `submission` (`assignment_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `submission_one_per_student` ON `submission` (`assignment_id`,`student_id`);