import { z } from 'zod';
import '../messages';
import { defaultChannelCount } from '../patch/index';

// Receivers; client-safe. Channel pools per protocol follow the engine
// (SBUS 16 + 2 digital, CRSF 16, PPM 8).

export const RC_PROTOCOL_VALUES = ['sbus', 'crsf', 'ppm'] as const;

/** { "3": "left stick up/down" } — keys are channel numbers. */
export const receiverLabels = z.record(
	z.string().regex(/^[1-9]\d?$/, 'Label keys are channel numbers.'),
	z.string().trim().min(1, 'An empty label: leave the channel out instead.').max(80)
);

const fields = {
	name: z.string().trim().min(1, 'Name the receiver.').max(120),
	protocol: z.enum(RC_PROTOCOL_VALUES),
	transmitterNotes: z.string().max(5000)
};

export const receiverCreate = z
	.strictObject({
		name: fields.name,
		protocol: fields.protocol.default('sbus'),
		transmitterNotes: fields.transmitterNotes.default(''),
		labels: receiverLabels.default({})
	})
	.superRefine((r, ctx) => checkLabels(r.protocol, r.labels, ctx));

export const receiverPatch = z.strictObject({
	name: fields.name.optional(),
	protocol: fields.protocol.optional(),
	transmitterNotes: fields.transmitterNotes.optional(),
	labels: receiverLabels.optional(),
	version: z.int().positive()
});

export function checkLabels(
	protocol: (typeof RC_PROTOCOL_VALUES)[number],
	labels: Record<string, string>,
	ctx: { addIssue: (i: { code: 'custom'; path: (string | number)[]; message: string }) => void }
): void {
	const count = defaultChannelCount(protocol);
	for (const key of Object.keys(labels)) {
		if (Number(key) > count) {
			ctx.addIssue({ code: 'custom', path: ['labels', key], message: `${protocol} has channels 1–${count}.` });
		}
	}
}

export const rcAssign = z.strictObject({
	fixtureIds: z.array(z.int().positive()).max(5000).optional(),
	keepExisting: z.boolean().default(false),
	apply: z.boolean().default(true)
});

export type ReceiverCreate = z.output<typeof receiverCreate>;
export type ReceiverPatch = z.output<typeof receiverPatch>;
