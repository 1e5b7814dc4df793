import type { PackTypeCreate } from './schemas/power';

// A small generic library of pack types to start from (issue 15). Invented, generic figures in
// the shapes the trade commonly uses (common practice): no maker's product is described here.
// Check capacity, maximum current and charge time against the packs you actually carry.
export const PACK_LIBRARY: { key: string; pack: PackTypeCreate }[] = [
	{
		key: 'li-ion-4s-98',
		pack: pack('4-cell Li-ion 98 Wh', 'li-ion', 4, { wattHours: 98 }, 10, 3.5, 'Cabin-friendly size: under 100 Wh.')
	},
	{ key: 'li-ion-6s-4.5', pack: pack('6-cell Li-ion 4.5 Ah', 'li-ion', 6, { ampHours: 4.5 }, 10, 3, '') },
	{
		key: 'li-ion-4s-150',
		pack: pack('4-cell Li-ion 150 Wh', 'li-ion', 4, { wattHours: 150 }, 12, 5, 'Above 100 Wh: airline approval to fly.')
	},
	{
		key: 'li-ion-8s-block',
		pack: pack('8-cell Li-ion block 10 Ah', 'li-ion', 8, { ampHours: 10 }, 20, 6, 'Above 160 Wh: ships as cargo.')
	},
	{ key: 'lifepo4-4s-20', pack: pack('4-cell LiFePO4 20 Ah', 'lifepo4', 4, { ampHours: 20 }, 40, 5, '') },
	{ key: 'lipo-6s-5', pack: pack('6-cell LiPo 5 Ah', 'lipo', 6, { ampHours: 5 }, 50, 1.5, '') }
];

function pack(
	name: string,
	chemistry: PackTypeCreate['chemistry'],
	cells: number,
	capacity: { ampHours?: number; wattHours?: number },
	maxCurrentA: number,
	chargeHours: number,
	notes: string
): PackTypeCreate {
	return {
		name,
		chemistry,
		cells,
		...capacity,
		maxCurrentA,
		onHand: 0,
		chargeHours,
		chargers: 1,
		chargerBays: 2,
		notes
	};
}
