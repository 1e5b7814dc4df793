import { sql } from 'drizzle-orm';
import {
	type AnySQLiteColumn,
	index,
	integer,
	primaryKey,
	real,
	sqliteTable,
	text,
	uniqueIndex
} from 'drizzle-orm/sqlite-core';

// Names follow ../shared/DESIGN.md ("Domain model"); keep them in step with the
// API shapes and the UI.

// The vocabularies live in the client-safe src/lib/vocab.ts; re-exported for the server's imports.
import {
	CHEMISTRIES,
	CONTROL_KINDS,
	FIXTURE_STATES,
	RC_PROTOCOLS,
	ROLES,
	SIGNOFF_DECISIONS,
	TRANSPORTS
} from '../../vocab';
export { CONTROL_KINDS, FIXTURE_STATES, RC_PROTOCOLS, ROLES, TRANSPORTS };
export type { ControlKind, FixtureState, RcProtocol, Role, Transport } from '../../vocab';
export const DECISIONS = SIGNOFF_DECISIONS;
export type Decision = (typeof DECISIONS)[number];

const now = sql`(unixepoch('subsec') * 1000)`;
const createdAt = () => integer('created_at', { mode: 'timestamp_ms' }).notNull().default(now);
const updatedAt = () => integer('updated_at', { mode: 'timestamp_ms' }).notNull().default(now);
const version = () => integer('version').notNull().default(1);

// ── Auth.js tables (shape required by @auth/drizzle-adapter) ────────────────

export const users = sqliteTable('user', {
	id: text('id')
		.primaryKey()
		.$defaultFn(() => crypto.randomUUID()),
	name: text('name'),
	email: text('email').unique(),
	emailVerified: integer('emailVerified', { mode: 'timestamp_ms' }),
	image: text('image'),
	// ours: null for accounts that only ever sign in by e-mailed link
	passwordHash: text('password_hash'),
	createdAt: integer('created_at', { mode: 'timestamp_ms' }).default(now),
	// ours: every session carries the generation it was issued under; bumping it (sign out everywhere,
	// password change, account removal) ends them all at the next request, cache or not
	sessionGeneration: integer('session_generation').notNull().default(0)
});

// ours: one signed-out session (its `sid`) until the day its cookie would have expired anyway
export const revokedSessions = sqliteTable('revoked_session', {
	sid: text('sid').primaryKey(),
	expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull()
});

// ours: single-use, expiring, hashed links that prove a mailbox (sign-up, setting a password)
export const accountTokens = sqliteTable(
	'account_token',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		email: text('email').notNull(),
		purpose: text('purpose', { enum: ['signup', 'password'] }).notNull(),
		tokenHash: text('token_hash').notNull().unique(),
		// sign-up: the name and password chosen, kept until the mailbox is proven
		name: text('name'),
		passwordHash: text('password_hash'),
		createdAt: createdAt(),
		expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
		usedAt: integer('used_at', { mode: 'timestamp_ms' })
	},
	(t) => [index('account_token_email').on(t.email)]
);

export const accounts = sqliteTable(
	'account',
	{
		userId: text('userId')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		type: text('type').$type<'email' | 'oauth' | 'oidc' | 'webauthn'>().notNull(),
		provider: text('provider').notNull(),
		providerAccountId: text('providerAccountId').notNull(),
		refresh_token: text('refresh_token'),
		access_token: text('access_token'),
		expires_at: integer('expires_at'),
		token_type: text('token_type'),
		scope: text('scope'),
		id_token: text('id_token'),
		session_state: text('session_state')
	},
	(t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })]
);

export const sessions = sqliteTable('session', {
	sessionToken: text('sessionToken').primaryKey(),
	userId: text('userId')
		.notNull()
		.references(() => users.id, { onDelete: 'cascade' }),
	expires: integer('expires', { mode: 'timestamp_ms' }).notNull()
});

export const verificationTokens = sqliteTable(
	'verificationToken',
	{
		identifier: text('identifier').notNull(),
		token: text('token').notNull(),
		expires: integer('expires', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [primaryKey({ columns: [t.identifier, t.token] })]
);

// ── Projects and people ─────────────────────────────────────────────────────

export const projects = sqliteTable('project', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	name: text('name').notNull(),
	venue: text('venue').notNull().default(''),
	startsOn: text('starts_on'),
	endsOn: text('ends_on'),
	notes: text('notes').notNull().default(''),
	// 1: paper universe 1 is Art-Net port-address 0 (the usual on-set convention); 0: they are equal
	artnetOffset: integer('artnet_offset').notNull().default(1),
	// power planning (issue 15): share of a pack's rated energy to plan on, and the shooting day
	usableFraction: real('usable_fraction').notNull().default(0.85),
	dayStart: text('day_start').notNull().default('08:00'),
	dayWrap: text('day_wrap').notNull().default('20:00'),
	version: version(),
	createdAt: createdAt(),
	updatedAt: updatedAt()
});

export const memberships = sqliteTable(
	'membership',
	{
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: text('role', { enum: ROLES }).notNull(),
		version: version(),
		createdAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.projectId, t.userId] }), index('membership_user').on(t.userId)]
);

export const invitations = sqliteTable(
	'invitation',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		email: text('email').notNull(),
		role: text('role', { enum: ROLES }).notNull(),
		tokenHash: text('token_hash').notNull().unique(),
		invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
		acceptedAt: integer('accepted_at', { mode: 'timestamp_ms' })
	},
	(t) => [index('invitation_project').on(t.projectId)]
);

// ── The rig ─────────────────────────────────────────────────────────────────

export const universes = sqliteTable(
	'universe',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		number: integer('number').notNull(),
		name: text('name').notNull().default(''),
		transport: text('transport', { enum: TRANSPORTS }).notNull().default('dmx-wired'),
		notes: text('notes').notNull().default(''),
		version: version(),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [uniqueIndex('universe_project_number').on(t.projectId, t.number)]
);

export const fixtureTypes = sqliteTable(
	'fixture_type',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		maker: text('maker').notNull(),
		model: text('model').notNull(),
		notes: text('notes').notNull().default(''),
		// fraction of full draw at zero intensity (electronics, fan); common practice 0.1
		drawFloor: real('draw_floor').notNull().default(0.1),
		version: version(),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [
		index('fixture_type_project').on(t.projectId),
		// maker + model names one type per project whatever the case (issue 16); SQLite's lower() folds
		// ASCII only, so db/fixture-types.ts also compares with toLocaleLowerCase before writing
		uniqueIndex('fixture_type_maker_model').on(t.projectId, sql`lower(${t.maker})`, sql`lower(${t.model})`)
	]
);

export const modes = sqliteTable(
	'mode',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		typeId: integer('type_id')
			.notNull()
			.references(() => fixtureTypes.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		position: integer('position').notNull().default(0),
		// draw at full output and accepted input voltage; all optional
		watts: real('watts'),
		inputVoltsMin: real('input_volts_min'),
		inputVoltsMax: real('input_volts_max')
	},
	(t) => [index('mode_type').on(t.typeId)]
);

export const modeChannels = sqliteTable(
	'mode_channel',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		modeId: integer('mode_id')
			.notNull()
			.references(() => modes.id, { onDelete: 'cascade' }),
		position: integer('position').notNull().default(0),
		// null: a virtual channel that takes no slot
		offset: integer('offset'),
		parameter: text('parameter').notNull(),
		bits: integer('bits').$type<8 | 16 | 24 | 32>().notNull().default(8),
		defaultValue: integer('default_value').notNull().default(0),
		// physical value at the start (min) and end (max) of the DMX range; may run downward
		min: real('min'),
		max: real('max'),
		unit: text('unit'),
		// DMX sub-range the physical range covers (GDTF ChannelFunction DMXFrom); null: the whole range
		dmxFrom: integer('dmx_from'),
		dmxTo: integer('dmx_to'),
		// GDTF DMXBreak: which of the fixture's start addresses the offset counts from
		dmxBreak: integer('dmx_break').notNull().default(1),
		// JSON [slot, …]: finer bytes that do not follow the coarse one (GDTF Offset "2,9")
		fineOffsets: text('fine_offsets', { mode: 'json' }).$type<number[]>()
	},
	(t) => [index('mode_channel_mode').on(t.modeId)]
);

export const receivers = sqliteTable(
	'receiver',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		protocol: text('protocol', { enum: RC_PROTOCOLS }).notNull().default('sbus'),
		transmitterNotes: text('transmitter_notes').notNull().default(''),
		version: version(),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [index('receiver_project').on(t.projectId)]
);

export const receiverLabels = sqliteTable(
	'receiver_label',
	{
		receiverId: integer('receiver_id')
			.notNull()
			.references(() => receivers.id, { onDelete: 'cascade' }),
		channel: integer('channel').notNull(),
		label: text('label').notNull()
	},
	(t) => [primaryKey({ columns: [t.receiverId, t.channel] })]
);

export const fixtures = sqliteTable(
	'fixture',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		number: integer('number').notNull(),
		label: text('label').notNull().default(''),
		typeId: integer('type_id')
			.notNull()
			.references(() => fixtureTypes.id, { onDelete: 'restrict' }),
		modeId: integer('mode_id')
			.notNull()
			.references(() => modes.id, { onDelete: 'restrict' }),
		position: text('position').notNull().default(''),
		groupName: text('group_name').notNull().default(''),
		linkGroup: text('link_group'),
		colour: text('colour').notNull().default(''),
		watts: integer('watts'),
		notes: text('notes').notNull().default(''),
		state: text('state', { enum: FIXTURE_STATES }).notNull().default('planned'),
		// control: one of five kinds; only the columns of its kind are set
		controlKind: text('control_kind', { enum: CONTROL_KINDS }).notNull().default('manual'),
		universeId: integer('universe_id').references(() => universes.id, { onDelete: 'restrict' }),
		address: integer('address'),
		// dmx with a multi-break mode: JSON [{ dmxBreak, universeId, address }] for breaks 2…n;
		// universe_id and address above stay break 1, so every existing fixture is break 1 as it was
		breakAddresses: text('break_addresses', { mode: 'json' }).$type<
			{ dmxBreak: number; universeId: number; address: number }[]
		>(),
		// dmx-map: JSON { parameter: address }
		addressMap: text('address_map', { mode: 'json' }).$type<Record<string, number>>(),
		receiverId: integer('receiver_id').references(() => receivers.id, { onDelete: 'restrict' }),
		// rc: JSON { parameter: channel }
		rcChannels: text('rc_channels', { mode: 'json' }).$type<Record<string, number>>(),
		leaderId: integer('leader_id').references((): AnySQLiteColumn => fixtures.id, {
			onDelete: 'restrict'
		}),
		// planned look for the colour preview swatch; all optional
		lookHue: real('look_hue'),
		lookSaturation: real('look_saturation'),
		lookIntensity: real('look_intensity'),
		lookCct: integer('look_cct'),
		// feed: a pack type, a circuit, or none
		packTypeId: integer('pack_type_id').references((): AnySQLiteColumn => packTypes.id, { onDelete: 'restrict' }),
		circuitId: integer('circuit_id').references((): AnySQLiteColumn => circuits.id, { onDelete: 'restrict' }),
		version: version(),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [
		uniqueIndex('fixture_project_number').on(t.projectId, t.number),
		index('fixture_project_universe_address').on(t.projectId, t.universeId, t.address),
		index('fixture_receiver').on(t.receiverId),
		index('fixture_leader').on(t.leaderId),
		index('fixture_by_type').on(t.typeId),
		index('fixture_by_mode').on(t.modeId),
		index('fixture_pack_type').on(t.packTypeId),
		index('fixture_circuit').on(t.circuitId)
	]
);

// ── Power (issue 15) ────────────────────────────────────────────────────────

export const packTypes = sqliteTable(
	'pack_type',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		chemistry: text('chemistry', { enum: CHEMISTRIES }).notNull(),
		cells: integer('cells').notNull(),
		// one of the two is given; the other derives from the nominal voltage
		ampHours: real('amp_hours'),
		wattHours: real('watt_hours'),
		maxCurrentA: real('max_current_a').notNull(),
		onHand: integer('on_hand').notNull().default(0),
		chargeHours: real('charge_hours'),
		chargers: integer('chargers').notNull().default(1),
		chargerBays: integer('charger_bays').notNull().default(1),
		notes: text('notes').notNull().default(''),
		version: version(),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [index('pack_type_project').on(t.projectId)]
);

export const circuits = sqliteTable(
	'circuit',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		volts: real('volts').notNull(),
		breakerA: real('breaker_a').notNull(),
		powerFactor: real('power_factor').notNull().default(0.9),
		notes: text('notes').notNull().default(''),
		version: version(),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [index('circuit_project').on(t.projectId)]
);

// Files uploaded by the crew (fixture photos); bytes live under data/uploads/.
export const uploads = sqliteTable(
	'upload',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		fixtureId: integer('fixture_id').references(() => fixtures.id, { onDelete: 'cascade' }),
		storedName: text('stored_name').notNull().unique(),
		originalName: text('original_name').notNull().default(''),
		mime: text('mime').notNull(),
		bytes: integer('bytes').notNull(),
		sha256: text('sha256').notNull(),
		uploadedBy: text('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [index('upload_fixture').on(t.fixtureId)]
);

// ── Paper trail ─────────────────────────────────────────────────────────────

export const revisions = sqliteTable(
	'revision',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		number: integer('number').notNull(),
		note: text('note').notNull().default(''),
		authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
		authorName: text('author_name').notNull().default(''),
		// immutable JSON snapshot of the whole patch
		snapshot: text('snapshot', { mode: 'json' }).$type<unknown>().notNull(),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('revision_project_number').on(t.projectId, t.number)]
);

export const reviewLinks = sqliteTable(
	'review_link',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		// null: always the latest revision
		revisionId: integer('revision_id').references(() => revisions.id, { onDelete: 'cascade' }),
		// SHA-256 of the token; the token itself is shown once and never stored
		tokenHash: text('token_hash').notNull().unique(),
		label: text('label').notNull().default(''),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		expiresAt: integer('expires_at', { mode: 'timestamp_ms' }),
		revokedAt: integer('revoked_at', { mode: 'timestamp_ms' })
	},
	(t) => [index('review_link_project').on(t.projectId)]
);

export const signoffs = sqliteTable(
	'signoff',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		revisionId: integer('revision_id')
			.notNull()
			.references(() => revisions.id, { onDelete: 'cascade' }),
		decision: text('decision', { enum: DECISIONS }).notNull(),
		name: text('name').notNull(),
		comment: text('comment').notNull().default(''),
		userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
		reviewLinkId: integer('review_link_id').references(() => reviewLinks.id, {
			onDelete: 'set null'
		}),
		createdAt: createdAt()
	},
	(t) => [index('signoff_revision').on(t.revisionId)]
);

export const auditLog = sqliteTable(
	'audit_log',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id').references(() => projects.id, { onDelete: 'cascade' }),
		userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
		// e.g. "fixture.update", "universe.delete"
		action: text('action').notNull(),
		entity: text('entity').notNull(),
		entityId: text('entity_id'),
		before: text('before', { mode: 'json' }).$type<unknown>(),
		after: text('after', { mode: 'json' }).$type<unknown>(),
		at: integer('at', { mode: 'timestamp_ms' }).notNull().default(now)
	},
	(t) => [index('audit_project_at').on(t.projectId, t.at)]
);

// Store first, send after: a mail that fails is retried, never lost.
export const mailOutbox = sqliteTable(
	'mail_outbox',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		to: text('to').notNull(),
		subject: text('subject').notNull(),
		text: text('text').notNull(),
		html: text('html').notNull(),
		// failed: every retry over at least 48 hours failed; shown to the project's owners to resend
		status: text('status', { enum: ['pending', 'sent', 'failed'] })
			.notNull()
			.default('pending'),
		attempts: integer('attempts').notNull().default(0),
		lastError: text('last_error'),
		createdAt: createdAt(),
		sentAt: integer('sent_at', { mode: 'timestamp_ms' }),
		nextAttemptAt: integer('next_attempt_at', { mode: 'timestamp_ms' }),
		giveUpAt: integer('give_up_at', { mode: 'timestamp_ms' }),
		// the project a mail is about, so its owners see it if it finally fails
		// no foreign key: a deleted project must not take its mail (or its failure record) with it
		projectId: integer('project_id'),
		kind: text('kind').notNull().default('other')
	},
	(t) => [index('mail_outbox_status').on(t.status, t.nextAttemptAt), index('mail_outbox_project').on(t.projectId)]
);
