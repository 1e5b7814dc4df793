import { PNG } from 'pngjs';
import { addMember, makeProject, makeUser } from '../helpers/factories';
import type { Client } from '../helpers/server';
import type { Db } from '../../src/lib/server/db/index';
import type { Role } from '../../src/lib/server/db/schema';

// THE authorization table (DESIGN.md "Roles"): one line per route × method with the
// expected status for each caller, and a builder for a request that would be VALID for
// a permitted caller, so the status says what authorization decided, not validation.
// Adding a route = adding one line here; tests/api/authz.test.ts fails until you do.
//
// Callers, in column order:
//   owner, programmer, electrician, viewer — members of the project under test
//   outsider — signed in, owner of ANOTHER project, not a member of this one (→ 404, never reveal it exists)
//   anonymous — no session
//   review — no session, holding a valid review-link token of this project (Authorization: Bearer + cookie);
//            outside /api/review/:token… it must count for nothing (anonymous-equivalent, 401)
// Routes under /api/review/[token] are authorised by the token in the path, not by role: the
// runner puts the valid token there for every caller.

export const CALLERS = ['owner', 'programmer', 'electrician', 'viewer', 'outsider', 'anonymous', 'review'] as const;
export type Caller = (typeof CALLERS)[number];
export type Expect = [
	owner: number,
	programmer: number,
	electrician: number,
	viewer: number,
	outsider: number,
	anonymous: number,
	review: number
];

export interface Req {
	/** route params beyond pid (pid is the project under test unless given) */
	params?: Record<string, string | number>;
	body?: unknown;
	/** query string, without the "?" */
	query?: string;
	/** multipart upload instead of JSON */
	form?: () => FormData;
}

export type FixtureKind = 'dmx' | 'dmx-map' | 'rc' | 'follow' | 'manual';

/** What a builder can make in the project it runs against (through the API, as that project's owner). */
export interface Ctx {
	pid: number;
	owner: Client;
	db: Db;
	seq(): number;
	/** current version of the project row, for PATCH /api/projects/[pid] */
	projectVersion(): number;
	/** a new project with the same four crew members, for DELETE /api/projects/[pid] */
	freshProject(): Promise<number>;
	universe(): Promise<{ id: number }>;
	type(): Promise<{ id: number; modeId: number }>;
	receiver(): Promise<{ id: number }>;
	/** a fresh fixture; without a kind, the next of the five in turn so every kind is exercised */
	fixture(kind?: FixtureKind): Promise<{ id: number; kind: FixtureKind }>;
	photo(fixtureId: number): Promise<{ id: number }>;
	/** a review link of revision 1, made by the owner */
	reviewLink(): Promise<{ id: number; url: string }>;
	/** a new user who is a viewer of this project */
	member(): Promise<{ userId: string }>;
	base: { typeId: number; modeId: number; universeId: number; receiverId: number };
}

export interface Row {
	method: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
	route: string;
	expect: Expect;
	build: (c: Ctx) => Promise<Req> | Req;
}

const row = (method: Row['method'], route: string, expect: Expect, build: Row['build'] = () => ({})): Row => ({
	method,
	route,
	expect,
	build
});

const fixture = async (c: Ctx) => ({ params: { id: (await c.fixture()).id } });

// prettier-ignore
export const ROUTES: Row[] = [
	//   method    route                                                  own  prog elec view out  anon review   valid request
	row('GET',    '/api/health',                                        [200, 200, 200, 200, 200, 200, 200]),
	// any /api path no route matches, e.g. a non-numeric id: JSON 404 for everyone
	row('GET',    '/api/[...rest]',                                     [404, 404, 404, 404, 404, 404, 404]),
	row('POST',   '/api/[...rest]',                                     [404, 404, 404, 404, 404, 404, 404]),
	row('PATCH',  '/api/[...rest]',                                     [404, 404, 404, 404, 404, 404, 404]),
	row('PUT',    '/api/[...rest]',                                     [404, 404, 404, 404, 404, 404, 404]),
	row('DELETE', '/api/[...rest]',                                     [404, 404, 404, 404, 404, 404, 404]),
	row('GET',    '/dev/mail.json',                                     [200, 200, 200, 200, 200, 200, 200]), // dev sink only, loopback callers only: gone when SMTP_URL is set or PATCHWRIGHT_ENV=production
	row('GET',    '/api/projects',                                      [200, 200, 200, 200, 200, 401, 401]),
	row('POST',   '/api/projects',                                      [201, 201, 201, 201, 201, 401, 401], () => ({ body: { name: 'Authz probe' } })),
	row('GET',    '/api/projects/[pid]',                                [200, 200, 200, 200, 404, 401, 401]),
	row('PATCH',  '/api/projects/[pid]',                                [200, 200, 403, 403, 404, 401, 401], (c) => ({ body: { notes: 'checked', version: c.projectVersion() } })),
	row('DELETE', '/api/projects/[pid]',                                [204, 403, 403, 403, 404, 401, 401], async (c) => ({ params: { pid: await c.freshProject() } })),
	row('GET',    '/api/projects/[pid]/patch',                          [200, 200, 200, 200, 404, 401, 401]),
	row('GET',    '/api/projects/[pid]/conflicts',                      [200, 200, 200, 200, 404, 401, 401]),
	row('GET',    '/api/projects/[pid]/events',                         [200, 200, 200, 200, 404, 401, 401], () => ({ query: 'once=1' })),
	row('GET',    '/api/projects/[pid]/members',                        [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/members',                        [201, 403, 403, 403, 404, 401, 401], (c) => ({ body: { email: `invitee-${c.seq()}@test.example`, role: 'viewer' } })),
	row('PATCH',  '/api/projects/[pid]/members/[userId]',               [200, 403, 403, 403, 404, 401, 401], async (c) => ({ params: { userId: (await c.member()).userId }, body: { role: 'electrician' } })),
	row('DELETE', '/api/projects/[pid]/members/[userId]',               [204, 403, 403, 403, 404, 401, 401], async (c) => ({ params: { userId: (await c.member()).userId } })),
	row('GET',    '/api/projects/[pid]/universes',                      [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/universes',                      [201, 201, 403, 403, 404, 401, 401], (c) => ({ body: { number: 100 + c.seq(), name: 'Probe', transport: 'sacn' } })),
	row('GET',    '/api/projects/[pid]/universes/[id]',                 [200, 200, 200, 200, 404, 401, 401], async (c) => ({ params: { id: (await c.universe()).id } })),
	row('PATCH',  '/api/projects/[pid]/universes/[id]',                 [200, 200, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await c.universe()).id }, body: { name: 'Renamed', version: 1 } })),
	row('DELETE', '/api/projects/[pid]/universes/[id]',                 [204, 204, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await c.universe()).id } })),
	row('GET',    '/api/projects/[pid]/types',                          [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/types',                          [201, 201, 403, 403, 404, 401, 401], (c) => ({ body: { ...TYPE_BODY, model: `Probe Panel ${c.seq()}` } })),
	row('GET',    '/api/projects/[pid]/types/[id]',                     [200, 200, 200, 200, 404, 401, 401], async (c) => ({ params: { id: (await c.type()).id } })),
	row('PATCH',  '/api/projects/[pid]/types/[id]',                     [200, 200, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await c.type()).id }, body: { notes: 'checked', version: 1 } })),
	row('DELETE', '/api/projects/[pid]/types/[id]',                     [204, 204, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await c.type()).id } })),
	row('GET',    '/api/projects/[pid]/fixtures',                       [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/fixtures',                       [201, 201, 403, 403, 404, 401, 401], (c) => ({ body: { number: 5000 + c.seq(), typeId: c.base.typeId, modeId: c.base.modeId } })),
	row('PATCH',  '/api/projects/[pid]/fixtures',                       [200, 200, 200, 403, 404, 401, 401], async (c) => ({ body: { fixtures: [{ id: (await c.fixture()).id, state: 'hung', version: 1 }] } })),
	row('DELETE', '/api/projects/[pid]/fixtures',                       [200, 200, 403, 403, 404, 401, 401], async (c) => ({ body: { ids: [(await c.fixture()).id] } })),
	row('POST',   '/api/projects/[pid]/fixtures/bulk',                  [200, 200, 403, 403, 404, 401, 401], async (c) => ({ body: { action: 'set', ids: [(await c.fixture()).id], fields: { state: 'hung' } } })),
	row('GET',    '/api/projects/[pid]/fixtures/[id]',                  [200, 200, 200, 200, 404, 401, 401], fixture),
	row('PATCH',  '/api/projects/[pid]/fixtures/[id]',                  [200, 200, 200, 403, 404, 401, 401], async (c) => ({ ...(await fixture(c)), body: { notes: 'seen on set', state: 'checked', version: 1 } })),
	row('DELETE', '/api/projects/[pid]/fixtures/[id]',                  [204, 204, 403, 403, 404, 401, 401], fixture),
	row('GET',    '/api/projects/[pid]/fixtures/[id]/photos',           [200, 200, 200, 200, 404, 401, 401], fixture),
	row('POST',   '/api/projects/[pid]/fixtures/[id]/photos',           [201, 201, 201, 403, 404, 401, 401], async (c) => ({ ...(await fixture(c)), form: photoForm })),
	row('GET',    '/api/projects/[pid]/fixtures/[id]/photos/[photoId]', [200, 200, 200, 200, 404, 401, 401], photo),
	row('DELETE', '/api/projects/[pid]/fixtures/[id]/photos/[photoId]', [204, 204, 204, 403, 404, 401, 401], photo),
	row('POST',   '/api/projects/[pid]/autopatch',                      [200, 200, 403, 403, 404, 401, 401], async (c) => ({ body: { fixtureIds: [(await c.fixture('manual')).id], universeId: c.base.universeId, start: 1 } })),
	row('GET',    '/api/projects/[pid]/receivers',                      [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/receivers',                      [201, 201, 403, 403, 404, 401, 401], () => ({ body: { name: 'Probe receiver', protocol: 'crsf', labels: { 1: 'left stick' } } })),
	row('GET',    '/api/projects/[pid]/receivers/[id]',                 [200, 200, 200, 200, 404, 401, 401], async (c) => ({ params: { id: (await c.receiver()).id } })),
	row('PATCH',  '/api/projects/[pid]/receivers/[id]',                 [200, 200, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await c.receiver()).id }, body: { name: 'Renamed', version: 1 } })),
	row('DELETE', '/api/projects/[pid]/receivers/[id]',                 [204, 204, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await c.receiver()).id } })),
	row('POST',   '/api/projects/[pid]/receivers/[id]/assign',          [200, 200, 403, 403, 404, 401, 401], (c) => ({ params: { id: c.base.receiverId }, body: { apply: false } })),
	row('GET',    '/api/projects/[pid]/pack-types',                     [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/pack-types',                     [201, 201, 403, 403, 404, 401, 401], () => ({ body: PACK_BODY })),
	row('GET',    '/api/projects/[pid]/pack-types/[id]',                [200, 200, 200, 200, 404, 401, 401], async (c) => ({ params: { id: (await made(c, '/pack-types', PACK_BODY)).id } })),
	row('PATCH',  '/api/projects/[pid]/pack-types/[id]',                [200, 200, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await made(c, '/pack-types', PACK_BODY)).id }, body: { onHand: 9, version: 1 } })),
	row('DELETE', '/api/projects/[pid]/pack-types/[id]',                [204, 204, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await made(c, '/pack-types', PACK_BODY)).id }, query: 'version=1' })),
	row('GET',    '/api/projects/[pid]/circuits',                       [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/circuits',                       [201, 201, 403, 403, 404, 401, 401], () => ({ body: CIRCUIT_BODY })),
	row('GET',    '/api/projects/[pid]/circuits/[id]',                  [200, 200, 200, 200, 404, 401, 401], async (c) => ({ params: { id: (await made(c, '/circuits', CIRCUIT_BODY)).id } })),
	row('PATCH',  '/api/projects/[pid]/circuits/[id]',                  [200, 200, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await made(c, '/circuits', CIRCUIT_BODY)).id }, body: { breakerA: 32, version: 1 } })),
	row('DELETE', '/api/projects/[pid]/circuits/[id]',                  [204, 204, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await made(c, '/circuits', CIRCUIT_BODY)).id } })),
	row('GET',    '/api/projects/[pid]/power',                          [200, 200, 200, 200, 404, 401, 401]),
	row('PATCH',  '/api/projects/[pid]/power',                          [200, 200, 403, 403, 404, 401, 401], (c) => ({ body: { dayStart: '07:30', version: c.projectVersion() } })),
	row('GET',    '/api/projects/[pid]/revisions',                      [200, 200, 200, 200, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/revisions',                      [201, 201, 403, 403, 404, 401, 401], () => ({ body: { note: 'authz probe' } })),
	row('GET',    '/api/projects/[pid]/revisions/[n]',                  [200, 200, 200, 200, 404, 401, 401], () => ({ params: { n: 1 } })),
	row('GET',    '/api/projects/[pid]/revisions/[n]/diff',             [200, 200, 200, 200, 404, 401, 401], () => ({ params: { n: 1 }, query: 'against=live' })),
	row('POST',   '/api/projects/[pid]/revisions/[n]/signoffs',         [201, 201, 201, 201, 404, 401, 401], () => ({ params: { n: 1 }, body: { decision: 'approved', comment: 'probe' } })),
	row('GET',    '/api/projects/[pid]/review-links',                   [200, 200, 403, 403, 404, 401, 401]),
	row('POST',   '/api/projects/[pid]/review-links',                   [201, 201, 403, 403, 404, 401, 401], () => ({ body: { revision: 1 } })),
	row('DELETE', '/api/projects/[pid]/review-links/[id]',              [204, 204, 403, 403, 404, 401, 401], async (c) => ({ params: { id: (await c.reviewLink()).id } })),
	row('GET',    '/api/projects/[pid]/sheets/patch.pdf',               [200, 200, 200, 200, 404, 401, 401]),
	row('GET',    '/api/projects/[pid]/sheets/labels.pdf',              [200, 200, 200, 200, 404, 401, 401]),
	row('GET',    '/api/projects/[pid]/sheets/radio.pdf',               [200, 200, 200, 200, 404, 401, 401]),
	row('GET',    '/api/projects/[pid]/sheets/power.pdf',               [200, 200, 200, 200, 404, 401, 401]),
	row('GET',    '/api/projects/[pid]/export.csv',                     [200, 200, 200, 200, 404, 401, 401]),
	row('GET',    '/api/projects/[pid]/export.json',                    [200, 200, 200, 200, 404, 401, 401]),
	// a preview (no apply): 200 with what it would change, nothing written
	row('POST',   '/api/projects/[pid]/import',                         [200, 200, 403, 403, 404, 401, 401], () => ({ form: () => csvForm('number,universe,address\n1,1,100\n') })),
	// any signed-in person restores an export into a new project of their own
	row('POST',   '/api/projects/import-json',                          [201, 201, 201, 201, 201, 401, 401], async (c) => ({ body: await (await c.owner.get(`/api/projects/${c.pid}/export.json`)).json() })),
	// authorised by the token in the path, whoever holds it
	row('GET',    '/api/review/[token]',                                [200, 200, 200, 200, 200, 200, 200]),
	// a link decides once per revision, so each caller signs through a link of its own
	row('POST',   '/api/review/[token]/signoff',                        [201, 201, 201, 201, 201, 201, 201], async (c) => ({ params: { token: new URL((await c.reviewLink()).url).pathname.split('/').pop()! }, body: { name: 'Probe Producer', decision: 'approved', comment: '' } })),
	row('GET',    '/api/review/[token]/sheets/[sheet]',                 [200, 200, 200, 200, 200, 200, 200], () => ({ params: { sheet: 'radio.pdf' } }))
];

// Page loads: the status of the HTML document for each caller (303 = sent elsewhere; a signed-out
// caller of a project page is sent to /signin and back — requireRole still refuses the data, see __data.json).
// prettier-ignore
export const PAGES: Row[] = [
	//   method  page                                                     own  prog elec view out  anon review
	row('GET',  '/',                                                    [200, 200, 200, 200, 200, 303, 303]),
	row('GET',  '/signin',                                              [303, 303, 303, 303, 303, 200, 200]),
	row('GET',  '/signin/check-email',                                  [200, 200, 200, 200, 200, 200, 200]),
	row('GET',  '/signup',                                              [303, 303, 303, 303, 303, 200, 200]),
	row('GET',  '/invite/[token]',                                      [200, 200, 200, 200, 200, 200, 200], () => ({ params: { token: 'not-a-real-invitation' } })),
	row('GET',  '/signup/confirm/[token]',                              [200, 200, 200, 200, 200, 200, 200], () => ({ params: { token: 'not-a-real-token' } })),
	row('GET',  '/account',                                             [200, 200, 200, 200, 200, 303, 303]),
	row('GET',  '/account/password',                                    [200, 200, 200, 200, 200, 200, 200]),
	row('GET',  '/account/password/[token]',                            [200, 200, 200, 200, 200, 200, 200], () => ({ params: { token: 'not-a-real-token' } })),
	row('GET',  '/dev/mail',                                            [200, 200, 200, 200, 200, 200, 200]),
	row('GET',  '/projects/[id]',                                       [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/members',                               [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/revisions',                             [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/review/[token]',                                      [200, 200, 200, 200, 200, 200, 200]),
	row('GET',  '/projects/[id]/patch',                                 [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/universes',                             [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/universes/[n]',                         [200, 200, 200, 200, 404, 303, 303], () => ({ params: { n: 1 } })),
	row('GET',  '/projects/[id]/types',                                 [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/radio',                                 [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/fixtures/[n]',                          [200, 200, 200, 200, 404, 303, 303], () => ({ params: { n: 1 } })),
	row('GET',  '/projects/[id]/power',                                 [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/import',                                [200, 200, 200, 200, 404, 303, 303]),
	row('GET',  '/projects/[id]/settings',                              [200, 403, 403, 403, 404, 303, 303])
];

// Form actions (`export const actions` in +page.server.ts): one line per action with the least role
// that may run it. Callers below it are refused — a member 403, the outsider 404 (never reveal the
// project), no session 401 — and nothing is written; callers at or above it reach the action, whose
// own answer (`allowed`: 400 for the empty form each probe sends, 200/303 where no field is needed,
// 404 for a row the empty form does not name — a member never gets 404 from requireRole) proves the
// role check let them through.
// tests/api/authz.test.ts reads every actions object and fails when an action has no line here.
export type MinRole = Role | 'user' | 'anyone';

export interface ActionRow {
	page: string;
	name: string;
	min: MinRole;
	allowed: number;
	/** route params for the page ([id] is the project under test, [n] its fixture number 1) */
	params?: Record<string, string | number>;
	/** signs its caller out (the runner signs the crew in again afterwards) */
	signsOut?: boolean;
}

const act = (page: string, name: string, min: MinRole, allowed: number, extra: Partial<ActionRow> = {}): ActionRow => ({
	page,
	name,
	min,
	allowed,
	...extra
});

const RANK: Record<string, number> = { viewer: 1, electrician: 2, programmer: 3, owner: 4 };

/** The status each caller should see for an action line, in CALLERS order. */
export function actionExpect(a: ActionRow): Expect {
	return CALLERS.map((caller) => {
		if (a.min === 'anyone') return a.allowed;
		if (caller === 'anonymous' || caller === 'review') return 401;
		if (a.min === 'user') return a.allowed;
		if (caller === 'outsider') return 404;
		return RANK[caller] >= RANK[a.min] ? a.allowed : 403;
	}) as Expect;
}

// prettier-ignore
export const ACTIONS: ActionRow[] = [
	//  page                                      action             least role     allowed
	act('/',                                      'create',          'user',        400),
	act('/projects/[id]/fixtures/[n]',            'state',           'electrician', 400, { params: { n: 1 } }),
	act('/projects/[id]/fixtures/[n]',            'note',            'electrician', 400, { params: { n: 1 } }),
	act('/projects/[id]/fixtures/[n]',            'addresses',       'programmer',  400, { params: { n: 1 } }),
	act('/projects/[id]/types',                   'create',          'programmer',  400),
	act('/projects/[id]/types',                   'update',          'programmer',  400),
	act('/projects/[id]/types',                   'deleteMode',      'programmer',  404),
	act('/projects/[id]/types',                   'delete',          'programmer',  404),
	act('/projects/[id]/settings',                'update',          'owner',       400),
	act('/projects/[id]/settings',                'delete',          'owner',       400),
	act('/projects/[id]/members',                 'invite',          'owner',       400),
	act('/projects/[id]/members',                 'role',            'owner',       400),
	act('/projects/[id]/members',                 'remove',          'owner',       400),
	act('/projects/[id]/members',                 'handover',        'owner',       400),
	act('/projects/[id]/members',                 'resend',          'owner',       400),
	act('/projects/[id]/members',                 'revoke',          'owner',       400),
	act('/projects/[id]/members',                 'resendMail',      'owner',       400),
	act('/projects/[id]/revisions',               'revise',          'programmer',  303),
	act('/projects/[id]/revisions',               'link',            'programmer',  200),
	act('/projects/[id]/revisions',               'revoke',          'programmer',  404),
	act('/projects/[id]/revisions',               'signoff',         'viewer',      404),
	act('/projects/[id]/power',                   'addPack',         'programmer',  400),
	act('/projects/[id]/power',                   'addPreset',       'programmer',  400),
	act('/projects/[id]/power',                   'editPack',        'programmer',  400),
	act('/projects/[id]/power',                   'deletePack',      'programmer',  404),
	act('/projects/[id]/power',                   'addCircuit',      'programmer',  400),
	act('/projects/[id]/power',                   'editCircuit',     'programmer',  400),
	act('/projects/[id]/power',                   'deleteCircuit',   'programmer',  404),
	act('/projects/[id]/power',                   'setDay',          'programmer',  400),
	act('/projects/[id]/power',                   'setFeed',         'programmer',  400),
	act('/projects/[id]/universes',               'create',          'programmer',  400),
	act('/projects/[id]/universes',               'update',          'programmer',  400),
	act('/projects/[id]/universes',               'delete',          'programmer',  404),
	act('/projects/[id]/radio',                   'create',          'programmer',  400),
	act('/projects/[id]/radio',                   'update',          'programmer',  400),
	act('/projects/[id]/radio',                   'delete',          'programmer',  404),
	act('/projects/[id]/radio',                   'preview',         'programmer',  404),
	act('/projects/[id]/radio',                   'assign',          'programmer',  404),
	act('/account',                               'rename',          'user',        400),
	act('/account',                               'password',        'user',        400),
	act('/account',                               'passwordLink',    'user',        200),
	act('/account',                               'signOutEverywhere', 'user',      303, { signsOut: true }),
	act('/account',                               'delete',          'user',        400),
	act('/account/password',                      'default',         'anyone',      400),
	act('/account/password/[token]',              'default',         'anyone',      400, { params: { token: 'not-a-real-token' } }),
	act('/signup',                                'default',         'anyone',      400),
	act('/signup/confirm/[token]',                'default',         'anyone',      400, { params: { token: 'not-a-real-token' } }),
	// authorised by the review token in the path ([token] is a valid one), whoever holds it
	act('/review/[token]',                        'signoff',         'anyone',      400),
	act('/invite/[token]',                        'default',         'user',        404, { params: { token: 'not-a-real-invitation' } })
];

export const TYPE_BODY = {
	maker: 'Testworks',
	model: 'Probe Panel',
	modes: [
		{
			name: '2ch',
			channels: [
				{ offset: 1, parameter: 'intensity', bits: 8 },
				{ offset: 2, parameter: 'cct', bits: 8 }
			]
		}
	]
};

export const PACK_BODY = { name: 'Probe pack', chemistry: 'li-ion', cells: 4, ampHours: 6.8, maxCurrentA: 10 };
export const CIRCUIT_BODY = { name: 'Probe circuit', volts: 230, breakerA: 16 };

/** Creates a row through the API as the project's owner (pack types, circuits). */
async function made(c: Ctx, path: string, body: unknown): Promise<{ id: number }> {
	const res = await c.owner.post(`/api/projects/${c.pid}${path}`, body);
	if (res.status !== 201) throw new Error(`setup: ${path} answered ${res.status}: ${await res.text()}`);
	return res.json();
}

function photo(c: Ctx) {
	return c.fixture().then(async (f) => ({ params: { id: f.id, photoId: (await c.photo(f.id)).id } }));
}

export function pngBytes(): Buffer {
	const png = new PNG({ width: 1, height: 1 });
	png.data.set([255, 128, 0, 255]);
	return PNG.sync.write(png);
}

export function csvForm(text: string): FormData {
	const form = new FormData();
	form.set('file', new Blob([text], { type: 'text/csv' }), 'patch.csv');
	return form;
}

export function photoForm(): FormData {
	const form = new FormData();
	form.set('file', new Blob([new Uint8Array(pngBytes())], { type: 'image/png' }), 'probe.png');
	return form;
}

/** Builds a Ctx for one project: `owner` is that project's owner client, `crew` the users to add to fresh projects. */
export async function makeCtx(db: Db, pid: number, owner: Client, crew: Record<Role, { id: string }>): Promise<Ctx> {
	let n = 0;
	const seq = () => ++n;
	const expectJson = async (res: Response, status: number) => {
		const body = await res.json();
		if (res.status !== status) throw new Error(`setup: ${res.url} answered ${res.status}: ${JSON.stringify(body)}`);
		return body;
	};
	const post = async (path: string, body: unknown) =>
		expectJson(await owner.post(`/api/projects/${pid}${path}`, body), 201);
	const t = await post('/types', TYPE_BODY);
	const u = await post('/universes', { number: 1, name: 'Deck', transport: 'dmx-wired' });
	const r = await post('/receivers', { name: 'Crane', protocol: 'sbus' });
	const leader = await post('/fixtures', {
		number: 1,
		typeId: t.id,
		modeId: t.modes[0].id,
		control: { kind: 'dmx', universeId: u.id, address: 1 }
	});
	const base = { typeId: t.id, modeId: t.modes[0].id, universeId: u.id, receiverId: r.id };
	const controls: Record<FixtureKind, () => unknown> = {
		dmx: () => ({ kind: 'dmx', universeId: u.id, address: 1 + ((n * 2) % 500) }),
		'dmx-map': () => ({ kind: 'dmx-map', universeId: u.id, addresses: { intensity: 10, cct: 300 } }),
		rc: () => ({ kind: 'rc', receiverId: r.id, channels: { intensity: 1, cct: 2 } }),
		follow: () => ({ kind: 'follow', leaderId: leader.id }),
		manual: () => ({ kind: 'manual' })
	};
	const kinds = Object.keys(controls) as FixtureKind[];
	let turn = 0;
	return {
		pid,
		owner,
		db,
		seq,
		base,
		projectVersion: () =>
			(db.$client.prepare('select version from project where id = ?').get(pid) as { version: number }).version,
		async freshProject() {
			const p = makeProject(db);
			for (const role of ['owner', 'programmer', 'electrician', 'viewer'] as const)
				addMember(db, p.id, crew[role].id, role);
			return p.id;
		},
		universe: () => post('/universes', { number: 1000 + seq() }),
		type: () =>
			post('/types', { ...TYPE_BODY, model: `Probe Panel ${seq()}` }).then((x) => ({
				id: x.id,
				modeId: x.modes[0].id
			})),
		receiver: () => post('/receivers', { name: `R${seq()}` }),
		async fixture(kind) {
			const k = kind ?? kinds[turn++ % kinds.length];
			const f = await post('/fixtures', {
				number: 100 + seq(),
				typeId: base.typeId,
				modeId: base.modeId,
				control: controls[k]()
			});
			return { id: f.id, kind: k };
		},
		async photo(fixtureId) {
			const res = await owner.fetch(`/api/projects/${pid}/fixtures/${fixtureId}/photos`, {
				method: 'POST',
				body: photoForm()
			});
			return expectJson(res, 201);
		},
		reviewLink: () => post('/review-links', { revision: 1 }),
		async member() {
			const user = await makeUser(db);
			addMember(db, pid, user.id, 'viewer');
			return { userId: user.id };
		}
	};
}
