import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { demoStage, mailedLink, screenshot } from './launch';

// Issue 16: a new programmer sets a project up from the browser alone — no API calls by hand —
// then renames and deletes what they made, including things in use (the dialogs name the fixtures).

const stage = demoStage();

const status = (page: Page, text: string) => page.getByRole('status').filter({ hasText: text }).waitFor();

describe('building blocks from the pages alone (Chromium)', () => {
	it('a new programmer builds, renames and deletes universes, types, modes, a receiver, an invitation and the project', async () => {
		const base = stage.server.url;
		const email = 'pat.rigger@crew.test';
		const page = await stage.browser.page({ width: 1440, height: 900 });

		// an account of their own, confirmed from the mailbox
		await page.goto(`${base}/signup`);
		await page.getByLabel('Your name').fill('Pat Rigger');
		await page.getByLabel('E-mail').fill(email);
		await page.getByLabel('Password').fill('spot lamps on the gantry');
		await page.getByRole('button', { name: 'Create account' }).click();
		await page.waitForURL(/\/signin\/check-email/);
		await page.goto(await mailedLink(base, email, '/signup/confirm/'));
		await page.getByRole('button', { name: 'Confirm and create my account' }).click();
		await page.waitForURL(/confirmed=1/);
		await page.getByLabel('Password').fill('spot lamps on the gantry');
		await page.getByRole('button', { name: 'Sign in', exact: true }).click();
		await page.waitForURL(`${base}/`);

		// a project
		await page.getByRole('button', { name: 'New project' }).click();
		await page.getByLabel('Name').fill('Harbour night');
		await page.getByRole('button', { name: 'Create project' }).click();
		await page.waitForURL(/\/projects\/\d+$/);
		const project = new URL(page.url()).pathname;

		// universes: an empty number is refused at the field, keeping the name typed
		await page.goto(`${base}${project}/universes`);
		const addUniverse = page.getByRole('form', { name: 'Add a universe' });
		await addUniverse.getByLabel('Number').fill('');
		await addUniverse.getByLabel('Name').fill('Deck');
		await addUniverse.getByRole('button', { name: 'Add universe' }).click();
		await addUniverse.locator('.field-error').first().waitFor();
		expect(await addUniverse.getByLabel('Name').inputValue()).toBe('Deck');
		await addUniverse.getByLabel('Number').fill('1');
		await addUniverse.getByRole('button', { name: 'Add universe' }).click();
		await status(page, 'Universe 1 added.');
		await addUniverse.getByLabel('Name').fill('Mast');
		await addUniverse.getByRole('button', { name: 'Add universe' }).click();
		await status(page, 'Universe 2 added.');

		// a type with two modes, built channel by channel; the slot count follows
		await page.goto(`${base}${project}/types`);
		const add = page.getByRole('form', { name: 'Add a fixture type' });
		await add.getByLabel('Maker').fill('Testworks');
		await add.getByLabel('Model').fill('Deck Tube');
		await add.getByLabel('Mode 1 name', { exact: true }).fill('HSI 8-bit');
		await add.getByRole('button', { name: 'Add channel' }).click();
		await add.getByLabel('Mode 1 channel 2 parameter', { exact: true }).fill('hue');
		await add.getByRole('button', { name: 'Add channel' }).click();
		await add.getByLabel('Mode 1 channel 3 parameter', { exact: true }).fill('saturation');
		expect(await add.locator('[data-mode="1"] [data-slot-count]').textContent()).toContain('3 slots');
		await add.getByRole('button', { name: 'Add mode' }).click();
		await add.getByLabel('Mode 2 name', { exact: true }).fill('HSI 16-bit');
		await add.getByLabel('Mode 2 channel 1 bit depth', { exact: true }).selectOption('16');
		await add.locator('[data-mode="2"]').getByRole('button', { name: 'Add channel' }).click();
		// the new channel starts after the 16-bit intensity: slot 3
		expect(await add.getByLabel('Mode 2 channel 2 offset', { exact: true }).inputValue()).toBe('3');
		await add.getByLabel('Mode 2 channel 2 parameter', { exact: true }).fill('hue');
		await add.getByLabel('Mode 2 channel 2 bit depth', { exact: true }).selectOption('16');
		expect(await add.locator('[data-mode="2"] [data-slot-count]').textContent()).toContain('4 slots');
		await add.getByRole('button', { name: 'Add type' }).click();
		await status(page, 'Testworks Deck Tube added.');

		// the same maker and model in other letters is refused at the field
		await add.getByLabel('Maker').fill('TESTWORKS');
		await add.getByLabel('Model').fill('deck tube');
		await add.getByLabel('Mode 1 name', { exact: true }).fill('1ch');
		await add.getByRole('button', { name: 'Add type' }).click();
		await add.getByText('Testworks Deck Tube already exists; edit that type instead.').waitFor();
		expect(await page.locator('article[data-type]').count()).toBe(1);

		// a receiver with a control label
		await page.goto(`${base}${project}/radio`);
		const addRx = page.getByRole('form', { name: 'Add a receiver' });
		await addRx.getByLabel('Name').fill('Car RX');
		await addRx.getByRole('button', { name: 'Add receiver' }).click();
		await status(page, 'Car RX');
		await page.getByRole('button', { name: 'Edit receiver Car RX' }).click();
		await page.getByLabel('Label of channel 1', { exact: true }).fill('left stick up/down');
		await page.getByRole('button', { name: 'Save receiver' }).click();
		await page.getByText('left stick up/down').first().waitFor();

		// two fixtures on the 8-bit mode, from the patch page
		await page.goto(`${base}${project}/patch`);
		const addFx = page.locator('details').filter({ has: page.getByText('Add fixtures', { exact: true }) });
		await addFx.getByText('Add fixtures', { exact: true }).click();
		await addFx.getByLabel('Type · mode').selectOption({ label: 'Testworks Deck Tube · HSI 8-bit (3)' });
		await addFx.getByLabel('How many').fill('2');
		await addFx.getByLabel('Label pattern').fill('DECK {n}');
		await addFx.getByLabel('Universe').selectOption({ label: '1 Deck' });
		await addFx.getByLabel('Start address').fill('1');
		await addFx.getByRole('button', { name: 'Add', exact: true }).click();
		await page.locator('[data-notice]').getByText('Added 2 fixture(s)').waitFor();

		// edit the type: rename it, reorder a channel, duplicate a mode
		await page.goto(`${base}${project}/types`);
		await page.getByRole('button', { name: 'Edit Testworks Deck Tube' }).click();
		const edit = page.getByRole('form', { name: 'Edit Testworks Deck Tube' });
		await edit.getByLabel('Model').fill('Deck Tube 2');
		await edit.getByRole('button', { name: 'Move Mode 2 channel 2 up', exact: true }).click();
		expect(await edit.getByLabel('Mode 2 channel 1 parameter', { exact: true }).inputValue()).toBe('hue');
		expect(await edit.getByLabel('Mode 2 channel 1 offset', { exact: true }).inputValue()).toBe('1');
		expect(await edit.getByLabel('Mode 2 channel 2 offset', { exact: true }).inputValue()).toBe('3');
		await edit.locator('[data-mode="2"]').getByRole('button', { name: 'Duplicate mode' }).click();
		expect(await edit.getByLabel('Mode 3 name', { exact: true }).inputValue()).toBe('HSI 16-bit copy');
		await screenshot(page, 'building-blocks-type-editor');
		await edit.getByRole('button', { name: 'Save type' }).click();
		await status(page, 'Testworks Deck Tube 2 saved.');
		expect(await page.locator('article[data-type="Testworks Deck Tube 2"]').getByText('3 modes').count()).toBe(1);

		// the 8-bit mode is in use: its dialog names the fixtures and moves them before deleting it
		await page.getByRole('button', { name: 'Edit Testworks Deck Tube 2' }).click();
		const edit2 = page.getByRole('form', { name: 'Edit Testworks Deck Tube 2' });
		await edit2.locator('[data-mode="1"]').getByRole('button', { name: 'Delete mode…' }).click();
		const dialog = page.getByRole('dialog');
		const named = await dialog.getByTestId('type-users').locator('li').allTextContents();
		expect(named.map((t) => t.replace(/\s+/g, ' ').trim())).toEqual(['1 DECK 1', '2 DECK 2']);
		await dialog.getByLabel('Move them to').selectOption({ label: 'HSI 16-bit · 4 slots' });
		await screenshot(page, 'building-blocks-delete-mode-dialog');
		await dialog.getByRole('button', { name: 'Move them and delete' }).click();
		await status(page, 'Mode deleted from Testworks Deck Tube 2.');
		expect(await page.locator('article[data-type="Testworks Deck Tube 2"]').getByText('2 modes').count()).toBe(1);

		// the type itself cannot go while fixtures use it and there is no other type: a sentence says why
		await page.getByRole('button', { name: 'Delete Testworks Deck Tube 2' }).click();
		await page.getByRole('dialog').getByText('There is no other fixture type to move them to.').waitFor();
		await page.getByRole('dialog').getByRole('button', { name: 'Cancel', exact: true }).click();

		// universes: rename one, delete the one in use (its fixtures set to manual)
		await page.goto(`${base}${project}/universes`);
		await page.getByRole('button', { name: 'Edit universe 2' }).click();
		await page.locator('[data-universe="2"]').getByLabel('Name').fill('Mast top');
		await page.getByRole('button', { name: 'Save universe 2' }).click();
		await status(page, 'Universe 2 saved.');
		await page.getByRole('button', { name: 'Delete universe 1' }).click();
		expect(await page.getByTestId('universe-users').textContent()).toContain('DECK 1');
		await page.getByRole('button', { name: 'Set them to manual and delete' }).click();
		await status(page, 'Universe deleted.');
		expect(await page.locator('[data-universe]').count()).toBe(1);

		// the receiver goes
		await page.goto(`${base}${project}/radio`);
		await page.getByRole('button', { name: 'Delete receiver Car RX' }).click();
		await page.getByRole('dialog').getByRole('button', { name: 'Delete receiver' }).click();
		await page.getByText('No receivers').first().waitFor();

		// crew: invite an electrician, see the invitation pending, withdraw it
		await page.goto(`${base}${project}/members`);
		await page.getByLabel('Invite by e-mail').fill('sam.sparks@crew.test');
		await page.getByLabel('Role', { exact: true }).selectOption('electrician');
		await page.getByRole('button', { name: 'Send invitation' }).click();
		await status(page, 'Invitation mailed');
		expect(await page.getByTestId('invitations').textContent()).toContain('sam.sparks@crew.test');
		await page.getByRole('button', { name: 'Withdraw the invitation to sam.sparks@crew.test' }).click();
		await expect.poll(() => page.getByTestId('invitations').count()).toBe(0);

		// restore a backup of it: a preview first, then a project named as a copy
		const backup = await (
			await page.request.get(`${base}/api/projects${project.slice('/projects'.length)}/export.json`)
		).body();
		await page.goto(`${base}${project}/import`);
		await page.setInputFiles('#restore-file', { name: 'harbour.json', mimeType: 'application/json', buffer: backup });
		const preview = page.getByTestId('restore-preview');
		await preview.getByText('2 fixtures').waitFor();
		expect(await preview.textContent()).toMatch(/Harbour night \(restored \d{4}-\d{2}-\d{2}\)/);
		await screenshot(page, 'building-blocks-restore-preview');
		await preview.getByRole('button', { name: 'Restore as a new project' }).click();
		await page.waitForURL((u) => /^\/projects\/\d+$/.test(u.pathname) && u.pathname !== project);
		expect(await page.getByRole('heading', { level: 1 }).textContent()).toMatch(/^Harbour night \(restored /);

		// the owner renames the original and deletes it by typing its name
		await page.goto(`${base}${project}/settings`);
		await page.getByLabel('Name', { exact: true }).fill('Harbour night, week 2');
		await page.getByRole('button', { name: 'Save settings' }).click();
		await status(page, 'Project settings saved.');
		await page.getByLabel('Type the project name to confirm').fill('Harbour night, week 2');
		await page.getByRole('button', { name: 'Delete project' }).click();
		await page.waitForURL(`${base}/`);
		const names = await page.getByTestId('project-list').textContent();
		expect(names).not.toContain('week 2');
		expect(names).toContain('Harbour night (restored');
		await page.close();
	}, 180_000);
});
