import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { startServer, type Client, type TestServer } from '../helpers/server';
import { TYPE_BODY } from './authz.table';

// Restoring a backup (issue 16): a preview that writes nothing, then a restore named so it is never
// confused with the original; junk JSON is refused with a sentence and leaves no project behind.

let server: TestServer;
let pid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;

beforeAll(async () => {
	server = await startServer();
	const { project, crew, outsider } = await makeCrew(server.db());
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
	const api = `/api/projects/${pid}`;
	await as.programmer.post(`${api}/universes`, { number: 1, name: 'Deck' });
	await as.programmer.post(`${api}/universes`, { number: 2, name: 'Mast' });
	const type = await (await as.programmer.post(`${api}/types`, TYPE_BODY)).json();
	await as.programmer.post(`${api}/receivers`, { name: 'Car RX', protocol: 'sbus' });
	await as.programmer.post(`${api}/fixtures`, [
		{ number: 1, label: 'A', typeId: type.id, modeId: type.modes[0].id },
		{ number: 2, label: 'B', typeId: type.id, modeId: type.modes[0].id }
	]);
});
afterAll(() => server?.stop());

const projectCount = async (c: Client) => (await (await c.get('/api/projects')).json()).projects.length;

function upload(c: Client, body: string, preview: boolean) {
	const form = new FormData();
	form.set('file', new Blob([body], { type: 'application/json' }), 'backup.json');
	return c.fetch(`/api/projects/import-json${preview ? '?preview=true' : ''}`, { method: 'POST', body: form });
}

describe('restore a backup', () => {
	it('previews what would be created, writing nothing, then restores it as "<name> (restored <date>)"', async () => {
		const backup = await (await as.owner.get(`/api/projects/${pid}/export.json`)).text();
		const name = JSON.parse(backup).project.name as string;
		const before = await projectCount(as.viewer);
		const res = await upload(as.viewer, backup, true);
		expect(res.status).toBe(200);
		const preview = await res.json();
		const today = new Date().toISOString().slice(0, 10);
		expect(preview).toEqual({
			ok: true,
			name,
			restoredName: `${name} (restored ${today})`,
			counts: { universes: 2, types: 1, modes: 1, fixtures: 2, receivers: 1 },
			message: '',
			problems: []
		});
		expect(await projectCount(as.viewer)).toBe(before);

		const made = await upload(as.viewer, backup, false);
		expect(made.status).toBe(201);
		const project = await made.json();
		expect(project).toMatchObject({ name: `${name} (restored ${today})`, role: 'owner' });
		const patch = await (await as.viewer.get(`/api/projects/${project.id}/patch`)).json();
		expect([patch.universes.length, patch.types.length, patch.fixtures.length, patch.receivers.length]).toEqual([
			2, 1, 2, 1
		]);
		expect(await projectCount(as.viewer)).toBe(before + 1);
	});

	it('a long name is shortened so the restored name still fits 120 characters', async () => {
		const backup = JSON.parse(await (await as.owner.get(`/api/projects/${pid}/export.json`)).text());
		backup.project.name = 'N'.repeat(120);
		const preview = await (await upload(as.viewer, JSON.stringify(backup), true)).json();
		expect(preview.ok).toBe(true);
		expect(preview.restoredName).toHaveLength(120);
		expect(preview.restoredName).toMatch(/^N+ \(restored \d{4}-\d{2}-\d{2}\)$/);
	});

	it('junk JSON — only a name, or a project with none of the lists — is refused in a sentence, no project made', async () => {
		const before = await projectCount(as.viewer);
		for (const junk of [
			{ name: 'Just a name' },
			{ format: 'patchwright-project', version: 1, project: { name: 'Hollow' } }
		]) {
			const preview = await (await upload(as.viewer, JSON.stringify(junk), true)).json();
			expect(preview.ok).toBe(false);
			expect(preview.message).toMatch(
				/^This file is not a project backup: it has no universes, fixture types or fixtures lists/
			);
			const res = await upload(as.viewer, JSON.stringify(junk), false);
			expect(res.status).toBe(422);
			expect((await res.json()).error.message).toBe(preview.message);
		}
		// a list is not even offered to the check: the upload sniff refuses anything but a JSON object
		const list = await upload(as.viewer, '[1, 2]', true);
		expect(list.status).toBe(415);
		expect((await list.json()).error.message).toBe('The file is not a JSON project export.');
		expect(await projectCount(as.viewer)).toBe(before);
	});

	it('a backup with problems names them in the preview and creates nothing', async () => {
		const backup = JSON.parse(await (await as.owner.get(`/api/projects/${pid}/export.json`)).text());
		backup.fixtures[1].typeId = 999999;
		backup.universes[0].number = 0;
		const before = await projectCount(as.viewer);
		const preview = await (await upload(as.viewer, JSON.stringify(backup), true)).json();
		expect(preview.ok).toBe(false);
		expect(preview.counts.fixtures).toBe(0);
		expect(preview.problems.map((p: { field: string }) => p.field)).toContain('universes.0.number');
		expect(await projectCount(as.viewer)).toBe(before);
	});
});

describe('CSV export', () => {
	it('starts with the UTF-8 byte-order mark EF BB BF only when asked (?bom=true)', async () => {
		// the UTF-8 encoding of U+FEFF is EF BB BF (Unicode Standard, ch. 23.8 "Specials")
		const fixture = (await (await as.viewer.get(`/api/projects/${pid}/fixtures`)).json()).fixtures[0];
		const renamed = await as.programmer.patch(`/api/projects/${pid}/fixtures/${fixture.id}`, {
			label: 'Décor 2 °',
			version: fixture.version
		});
		expect(renamed.status).toBe(200);
		const bytes = async (query: string) =>
			new Uint8Array(await (await as.viewer.get(`/api/projects/${pid}/export.csv${query}`)).arrayBuffer());
		const plain = await bytes('');
		const marked = await bytes('?bom=true');
		expect([...marked.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
		expect([...plain.slice(0, 3)]).not.toEqual([0xef, 0xbb, 0xbf]);
		// otherwise the same bytes, accents included
		expect([...marked.slice(3)]).toEqual([...plain]);
		expect(new TextDecoder().decode(plain)).toContain('Décor 2 °');
		expect([...(await bytes('?bom=no'))]).toEqual([...plain]);
	});
});
