-- Maker + model name one fixture type per project, whatever the letter case (issue 16: a CSV row
-- naming a duplicated pair silently picked the wrong one). Databases from before this rule may hold
-- duplicates, and a migration that refused them would stop the server from starting on the crew's
-- existing file. So nothing is merged (fixtures keep the exact type and mode they had) and nothing
-- is deleted: the oldest type of each pair keeps its name, every later one gets " (2)", " (3)" … after
-- its model, and each rename is written to the audit log (action type.rename-duplicate, before and
-- after) so the programmer sees it on the types page and in the history and can merge by hand.
INSERT INTO `audit_log` (`project_id`, `user_id`, `action`, `entity`, `entity_id`, `before`, `after`)
SELECT `project_id`, NULL, 'type.rename-duplicate', 'fixture_type', CAST(`id` AS TEXT),
	json_object('maker', `maker`, 'model', `model`),
	json_object('maker', `maker`, 'model', `model` || ' (' || `n` || ')', 'sameAs', `first_id`)
FROM (
	SELECT `id`, `project_id`, `maker`, `model`,
		row_number() OVER (PARTITION BY `project_id`, lower(`maker`), lower(`model`) ORDER BY `id`) AS `n`,
		first_value(`id`) OVER (PARTITION BY `project_id`, lower(`maker`), lower(`model`) ORDER BY `id`) AS `first_id`
	FROM `fixture_type`
) WHERE `n` > 1;
--> statement-breakpoint
UPDATE `fixture_type` SET `model` = `fixture_type`.`model` || ' (' || `d`.`n` || ')', `version` = `fixture_type`.`version` + 1
FROM (
	SELECT `id`, row_number() OVER (PARTITION BY `project_id`, lower(`maker`), lower(`model`) ORDER BY `id`) AS `n`
	FROM `fixture_type`
) AS `d`
WHERE `d`.`id` = `fixture_type`.`id` AND `d`.`n` > 1;
--> statement-breakpoint
-- A renamed type can meet a type already called "… (2)"; the later of such a pair also takes its id.
INSERT INTO `audit_log` (`project_id`, `user_id`, `action`, `entity`, `entity_id`, `before`, `after`)
SELECT `t`.`project_id`, NULL, 'type.rename-duplicate', 'fixture_type', CAST(`t`.`id` AS TEXT),
	json_object('maker', `t`.`maker`, 'model', `t`.`model`),
	json_object('maker', `t`.`maker`, 'model', `t`.`model` || ' (type ' || `t`.`id` || ')')
FROM `fixture_type` AS `t`
WHERE EXISTS (
	SELECT 1 FROM `fixture_type` AS `o`
	WHERE `o`.`project_id` = `t`.`project_id` AND lower(`o`.`maker`) = lower(`t`.`maker`)
		AND lower(`o`.`model`) = lower(`t`.`model`) AND `o`.`id` < `t`.`id`
);
--> statement-breakpoint
UPDATE `fixture_type` SET `model` = `model` || ' (type ' || `id` || ')', `version` = `version` + 1
WHERE EXISTS (
	SELECT 1 FROM `fixture_type` AS `o`
	WHERE `o`.`project_id` = `fixture_type`.`project_id` AND lower(`o`.`maker`) = lower(`fixture_type`.`maker`)
		AND lower(`o`.`model`) = lower(`fixture_type`.`model`) AND `o`.`id` < `fixture_type`.`id`
);
--> statement-breakpoint
CREATE UNIQUE INDEX `fixture_type_maker_model` ON `fixture_type` (`project_id`,lower("maker"),lower("model"));
