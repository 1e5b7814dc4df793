ALTER TABLE `fixture` ADD `break_addresses` text;-- hand-written below
-- Nothing to move: fixture.universe_id and fixture.address are break 1 of every existing fixture, and
-- mode_channel.dmx_break defaults to 1 (0001), so all existing data is break 1 as it was.
