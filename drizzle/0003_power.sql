CREATE TABLE `circuit` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`name` text NOT NULL,
	`volts` real NOT NULL,
	`breaker_a` real NOT NULL,
	`power_factor` real DEFAULT 0.9 NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `project`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `circuit_project` ON `circuit` (`project_id`);--> statement-breakpoint
CREATE TABLE `pack_type` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`name` text NOT NULL,
	`chemistry` text NOT NULL,
	`cells` integer NOT NULL,
	`amp_hours` real,
	`watt_hours` real,
	`max_current_a` real NOT NULL,
	`on_hand` integer DEFAULT 0 NOT NULL,
	`charge_hours` real,
	`chargers` integer DEFAULT 1 NOT NULL,
	`charger_bays` integer DEFAULT 1 NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `project`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `pack_type_project` ON `pack_type` (`project_id`);--> statement-breakpoint
ALTER TABLE `fixture_type` ADD `draw_floor` real DEFAULT 0.1 NOT NULL;--> statement-breakpoint
ALTER TABLE `fixture` ADD `pack_type_id` integer REFERENCES pack_type(id);--> statement-breakpoint
ALTER TABLE `fixture` ADD `circuit_id` integer REFERENCES circuit(id);--> statement-breakpoint
CREATE INDEX `fixture_pack_type` ON `fixture` (`pack_type_id`);--> statement-breakpoint
CREATE INDEX `fixture_circuit` ON `fixture` (`circuit_id`);--> statement-breakpoint
ALTER TABLE `mode` ADD `watts` real;--> statement-breakpoint
ALTER TABLE `mode` ADD `input_volts_min` real;--> statement-breakpoint
ALTER TABLE `mode` ADD `input_volts_max` real;--> statement-breakpoint
ALTER TABLE `project` ADD `usable_fraction` real DEFAULT 0.85 NOT NULL;--> statement-breakpoint
ALTER TABLE `project` ADD `day_start` text DEFAULT '08:00' NOT NULL;--> statement-breakpoint
ALTER TABLE `project` ADD `day_wrap` text DEFAULT '20:00' NOT NULL;