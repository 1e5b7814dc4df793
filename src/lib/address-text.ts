// How people write a DMX address on paper and in the table: "2.101" (universe.address, the form
// the table shows) or a bare "101" when the universe is chosen elsewhere. Pure, client-safe.

export type AddressText = { ok: true; universe: number | null; address: number } | { ok: false; message: string };

const DOTTED = /^\s*(\d+)\s*[./:]\s*(\d+)\s*$/;
const BARE = /^\s*(\d+)\s*$/;

/** Addresses are 1–512 (ANSI E1.11 DMX512-A, 512 slots after the start code). */
export function parseAddressText(text: string): AddressText {
	const dotted = DOTTED.exec(text);
	const bare = dotted ? null : BARE.exec(text);
	if (!dotted && !bare)
		return { ok: false, message: `“${text.trim()}” is not an address: write it as 2.101 (universe 2, address 101).` };
	const universe = dotted ? Number(dotted[1]) : null;
	const address = Number(dotted ? dotted[2] : bare![1]);
	if (address < 1 || address > 512)
		return { ok: false, message: `Address ${address} is outside 1–512 (a DMX universe has 512 slots).` };
	if (universe !== null && universe < 1) return { ok: false, message: 'Universe numbers start at 1.' };
	return { ok: true, universe, address };
}
