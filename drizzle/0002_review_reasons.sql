CREATE TABLE `rotations` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`title` text NOT NULL,
	`light` text NOT NULL,
	`from_date` text NOT NULL,
	`to_date` text NOT NULL,
	`start_time` text NOT NULL,
	`end_time` text NOT NULL,
	`on_days` integer NOT NULL,
	`off_days` integer NOT NULL,
	`travel_minutes` integer,
	`assignee_ids` text NOT NULL,
	`created_by` integer,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `people`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `rotations_site_idx` ON `rotations` (`site_id`,`from_date`);--> statement-breakpoint
ALTER TABLE `people` ADD `timezone` text;--> statement-breakpoint
ALTER TABLE `people` ADD `home_site_id` integer;--> statement-breakpoint
ALTER TABLE `reviews` ADD `snapshot` text;--> statement-breakpoint
ALTER TABLE `shifts` ADD `review_reasons` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `shifts` ADD `rotation_id` integer REFERENCES rotations(id);--> statement-breakpoint
CREATE INDEX `shifts_rotation_idx` ON `shifts` (`rotation_id`,`start_at`);