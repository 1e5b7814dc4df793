// DMX512 timing, ANSI E1.11. Transmitters may go slower than these minimums; this is the fastest
// refresh a universe can have when frames stop after its highest used slot.

// E1.11: 250 kbit/s, so a slot of 1 start + 8 data + 2 stop bits lasts 11 × 4 µs = 44 µs.
export const SLOT_US = 44;
// E1.11: break ≥ 92 µs and mark-after-break ≥ 12 µs at the transmitter.
export const MIN_BREAK_US = 92;
export const MIN_MAB_US = 12;
// E1.11: minimum break-to-break time 1204 µs, so a frame with very few slots is padded
// (value from memory of the standard's timing table; check against the text before relying on it).
export const MIN_BREAK_TO_BREAK_US = 1204;

export interface FrameTiming {
	slots: number;
	/** Break to break, µs. */
	frameUs: number;
	/** Frames per second. */
	rateHz: number;
}

export interface FrameOptions {
	breakUs?: number;
	mabUs?: number;
}

/** Frame time for a universe whose highest used slot is `slots` (the start code counts as one more slot). */
export function dmxFrameTiming(slots: number, options: FrameOptions = {}): FrameTiming {
	if (!Number.isInteger(slots) || slots < 0 || slots > 512)
		throw new RangeError(`slot count ${slots} is outside 0–512`);
	const breakUs = Math.max(options.breakUs ?? MIN_BREAK_US, MIN_BREAK_US);
	const mabUs = Math.max(options.mabUs ?? MIN_MAB_US, MIN_MAB_US);
	const frameUs = Math.max(breakUs + mabUs + (slots + 1) * SLOT_US, MIN_BREAK_TO_BREAK_US);
	return { slots, frameUs, rateHz: 1e6 / frameUs };
}

export interface RefreshFigures {
	/** Highest used slot: where a frame may stop. */
	highestSlot: number;
	/** Best case: the transmitter stops each frame after the highest used slot. */
	bestHz: number;
	/** A transmitter that always sends all 512 slots (E1.11 full frame: about 44 Hz). */
	fullHz: number;
	/** "up to 830 Hz if the transmitter sends 24 slots; 44 Hz at 512" */
	text: string;
}

/** Both refresh figures of a universe: many transmitters send all 512 slots whatever is patched. */
export function refreshFigures(highestSlot: number): RefreshFigures {
	const bestHz = dmxFrameTiming(highestSlot).rateHz;
	const fullHz = dmxFrameTiming(512).rateHz;
	// an empty universe has no best case to promise: only the full-frame figure means anything
	const text =
		highestSlot >= 512
			? `${Math.floor(fullHz)} Hz at 512 slots`
			: highestSlot <= 0
				? `nothing patched yet; ${Math.floor(fullHz)} Hz at 512`
				: `up to ${Math.floor(bestHz)} Hz if the transmitter sends ${highestSlot} slot${highestSlot === 1 ? '' : 's'}; ${Math.floor(fullHz)} Hz at 512`;
	return { highestSlot, bestHz, fullHz, text };
}
