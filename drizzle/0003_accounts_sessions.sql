CREATE TABLE `sessions` (
	`id_hash` text PRIMARY KEY NOT NULL,
	`person_id` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	`ended_at` integer,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `sessions_person_idx` ON `sessions` (`person_id`);--> statement-breakpoint
CREATE TABLE `sign_in_limits` (
	`key` text PRIMARY KEY NOT NULL,
	`failures` integer NOT NULL,
	`last_failure_at` integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE `invitations` ADD `purpose` text DEFAULT 'invitation' NOT NULL;