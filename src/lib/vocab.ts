// The product's vocabularies in one client-safe place (DESIGN.md "Domain model"): the schema, zod
// schemas, engine and pages all take their lists from here, and people read the display names.

export const ROLES = ['owner', 'programmer', 'electrician', 'viewer'] as const;
export type Role = (typeof ROLES)[number];
export const ROLE_LABELS: Record<Role, string> = {
	owner: 'Owner',
	programmer: 'Programmer',
	electrician: 'Electrician',
	viewer: 'Viewer'
};

export const TRANSPORTS = ['dmx-wired', 'dmx-wireless', 'sacn', 'artnet'] as const;
export type Transport = (typeof TRANSPORTS)[number];
/** What people read on pages and sheets; the codes stay in the API and files. */
export const TRANSPORT_LABELS: Record<Transport, string> = {
	'dmx-wired': 'Wired DMX',
	'dmx-wireless': 'Wireless DMX',
	sacn: 'sACN',
	artnet: 'Art-Net'
};

export const FIXTURE_STATES = ['planned', 'hung', 'addressed', 'checked', 'fault'] as const;
export type FixtureState = (typeof FIXTURE_STATES)[number];
export const STATE_LABELS: Record<FixtureState, string> = {
	planned: 'Planned',
	hung: 'Hung',
	addressed: 'Addressed',
	checked: 'Checked',
	fault: 'Fault'
};

export const CONTROL_KINDS = ['dmx', 'dmx-map', 'rc', 'follow', 'manual'] as const;
export type ControlKind = (typeof CONTROL_KINDS)[number];
export const CONTROL_LABELS: Record<ControlKind, string> = {
	dmx: 'DMX',
	'dmx-map': 'DMX, address per parameter',
	rc: 'RC radio',
	follow: 'Follows another fixture',
	manual: 'Manual'
};

export const RC_PROTOCOLS = ['sbus', 'crsf', 'ppm'] as const;
export type RcProtocol = (typeof RC_PROTOCOLS)[number];
export const RC_PROTOCOL_LABELS: Record<RcProtocol, string> = {
	sbus: 'SBUS (16 + 2 digital)',
	crsf: 'CRSF (16)',
	ppm: 'PPM (8)'
};

export const SIGNOFF_DECISIONS = ['approved', 'changes-requested'] as const;
export type SignoffDecision = (typeof SIGNOFF_DECISIONS)[number];

// Power (issue 15): pack chemistries and what feeds a fixture.
export const CHEMISTRIES = ['li-ion', 'lipo', 'lifepo4'] as const;
export type Chemistry = (typeof CHEMISTRIES)[number];
export const CHEMISTRY_LABELS: Record<Chemistry, string> = {
	'li-ion': 'Li-ion',
	lipo: 'LiPo',
	lifepo4: 'LiFePO4'
};
export const FEED_KINDS = ['battery', 'mains', 'none'] as const;
export type FeedKind = (typeof FEED_KINDS)[number];
export const FEED_LABELS: Record<FeedKind, string> = { battery: 'Battery', mains: 'Mains', none: 'None' };
