import { z } from 'zod';

// Maps keyed by names people type (parameters, channels). zod's record skips a `__proto__` key
// without a word (assigning it would replace the result's prototype), so the key would silently
// vanish; it is refused here instead, naming the key. `constructor` and `prototype` are stored as
// ordinary keys (zod assigns them as own properties; readers use Object.hasOwn).

export const RESERVED_KEYS: readonly string[] = ['__proto__'];

export function keyedRecord<K extends z.core.$ZodRecordKey, V extends z.ZodType>(key: K, value: V) {
	return z
		.unknown()
		.superRefine((input, ctx) => {
			if (typeof input !== 'object' || input === null) return;
			for (const k of Object.keys(input)) {
				if (RESERVED_KEYS.includes(k))
					ctx.addIssue({
						code: 'custom',
						path: [k],
						message: `"${k}" cannot be used as a name here; rename it.`
					});
			}
		})
		.pipe(z.record(key, value));
}
