ALTER TABLE `fixture` ADD `break_addresses` text;--> statement-breakpoint
ALTER TABLE `mode_channel` ADD `dmx_from` integer;--> statement-breakpoint
ALTER TABLE `mode_channel` ADD `dmx_to` integer;--> statement-breakpoint
ALTER TABLE `mode_channel` ADD `dmx_break` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `mode_channel` ADD `fine_offsets` text;
-- hand-written below
-- Nothing to move: fixture.universe_id and fixture.address are break 1 of every existing fixture, and
-- mode_channel.dmx_break defaults to 1, so all existing data is break 1 as it was.
