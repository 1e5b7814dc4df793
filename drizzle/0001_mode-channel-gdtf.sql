ALTER TABLE `mode_channel` ADD `dmx_from` integer;--> statement-breakpoint
ALTER TABLE `mode_channel` ADD `dmx_to` integer;--> statement-breakpoint
ALTER TABLE `mode_channel` ADD `dmx_break` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `mode_channel` ADD `fine_offsets` text;