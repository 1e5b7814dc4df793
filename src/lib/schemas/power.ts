import { z } from 'zod';
import { CHEMISTRIES } from '../vocab';

// Pack types, circuits and the project's power settings (issue 15); client-safe.

const positive = (what: string, max: number) =>
	z.number().finite().positive(`${what} must be more than 0.`).max(max, `${what} is at most ${max}.`);

const packFields = {
	name: z.string().trim().min(1, 'Name the pack type.').max(80),
	chemistry: z.enum(CHEMISTRIES, { message: 'Chemistry is li-ion, lipo or lifepo4.' }),
	// the common battery units take 4–6 cells in series; 14 covers the larger block batteries
	cells: z.int().min(1, 'Cells in series are 1–14.').max(14, 'Cells in series are 1–14.'),
	ampHours: positive('Capacity (Ah)', 1000).nullable(),
	wattHours: positive('Capacity (Wh)', 20000).nullable(),
	maxCurrentA: positive('Maximum current', 1000),
	onHand: z.int().min(0, 'Packs on hand are 0 or more.').max(10000),
	chargeHours: positive('Charge time', 48).nullable(),
	chargers: z.int().min(0).max(1000),
	chargerBays: z.int().min(0).max(64),
	notes: z.string().max(2000)
};

const oneCapacity = (p: { ampHours?: number | null; wattHours?: number | null }) =>
	!(p.ampHours != null && p.wattHours != null);

export const packTypeCreate = z
	.strictObject({
		name: packFields.name,
		chemistry: packFields.chemistry,
		cells: packFields.cells,
		ampHours: packFields.ampHours.optional(),
		wattHours: packFields.wattHours.optional(),
		maxCurrentA: packFields.maxCurrentA,
		onHand: packFields.onHand.default(0),
		chargeHours: packFields.chargeHours.default(null),
		chargers: packFields.chargers.default(1),
		chargerBays: packFields.chargerBays.default(1),
		notes: packFields.notes.default('')
	})
	.refine((p) => p.ampHours != null || p.wattHours != null, {
		path: ['ampHours'],
		message: 'Give the capacity in Ah or in Wh.'
	})
	.refine(oneCapacity, { path: ['wattHours'], message: 'Give Ah or Wh, not both: one derives the other.' });

export const packTypePatch = z
	.strictObject({
		name: packFields.name.optional(),
		chemistry: packFields.chemistry.optional(),
		cells: packFields.cells.optional(),
		ampHours: packFields.ampHours.optional(),
		wattHours: packFields.wattHours.optional(),
		maxCurrentA: packFields.maxCurrentA.optional(),
		onHand: packFields.onHand.optional(),
		chargeHours: packFields.chargeHours.optional(),
		chargers: packFields.chargers.optional(),
		chargerBays: packFields.chargerBays.optional(),
		notes: packFields.notes.optional(),
		version: z.int().positive()
	})
	.refine(oneCapacity, { path: ['wattHours'], message: 'Give Ah or Wh, not both: one derives the other.' });

const circuitFields = {
	name: z.string().trim().min(1, 'Name the circuit.').max(80),
	volts: positive('Voltage', 1000),
	breakerA: positive('Breaker rating', 10000),
	powerFactor: z.number().finite().min(0.3, 'Power factor is 0.3–1.').max(1, 'Power factor is 0.3–1.'),
	notes: z.string().max(2000)
};

export const circuitCreate = z.strictObject({
	name: circuitFields.name,
	volts: circuitFields.volts,
	breakerA: circuitFields.breakerA,
	// common practice for LED drivers
	powerFactor: circuitFields.powerFactor.default(0.9),
	notes: circuitFields.notes.default('')
});

export const circuitPatch = z.strictObject({
	name: circuitFields.name.optional(),
	volts: circuitFields.volts.optional(),
	breakerA: circuitFields.breakerA.optional(),
	powerFactor: circuitFields.powerFactor.optional(),
	notes: circuitFields.notes.optional(),
	version: z.int().positive()
});

const clock = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Times are HH:MM, 00:00–23:59.');

export const powerSettingsPatch = z.strictObject({
	usableFraction: z
		.number()
		.finite()
		.min(0.3, 'Usable share is 30–100 %.')
		.max(1, 'Usable share is 30–100 %.')
		.optional(),
	dayStart: clock.optional(),
	dayWrap: clock.optional(),
	/** the project's version */
	version: z.int().positive()
});

export type PackTypeCreate = z.output<typeof packTypeCreate>;
export type PackTypePatch = z.output<typeof packTypePatch>;
export type CircuitCreate = z.output<typeof circuitCreate>;
export type CircuitPatch = z.output<typeof circuitPatch>;
export type PowerSettingsPatch = z.output<typeof powerSettingsPatch>;
