CREATE TABLE `field_check_ins` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`outing_id` integer NOT NULL,
	`at` integer NOT NULL,
	`person_id` integer,
	`note` text DEFAULT '' NOT NULL,
	FOREIGN KEY (`outing_id`) REFERENCES `field_outings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`person_id`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `field_check_ins_outing_idx` ON `field_check_ins` (`outing_id`,`at`);--> statement-breakpoint
CREATE TABLE `field_outings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`shift_id` integer NOT NULL,
	`departed_at` integer NOT NULL,
	`expected_back_at` integer NOT NULL,
	`departed_by` integer,
	`returned_at` integer,
	`returned_by` integer,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`shift_id`) REFERENCES `shifts`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`departed_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`returned_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `field_outings_shift_idx` ON `field_outings` (`shift_id`);--> statement-breakpoint
CREATE INDEX `field_outings_open_idx` ON `field_outings` (`returned_at`,`expected_back_at`);--> statement-breakpoint
ALTER TABLE `observations` ADD `visibility_m` real;--> statement-breakpoint
ALTER TABLE `people` ADD `units` text DEFAULT 'metric' NOT NULL;--> statement-breakpoint
ALTER TABLE `shifts` ADD `travel_minutes` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `sites` ADD `travel_minutes` integer DEFAULT 0 NOT NULL;