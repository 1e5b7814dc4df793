import { z } from 'zod';

// The one place validation problems become sentences a crew member understands. Installed as
// zod's global error map, so every schema (API `issues`, form `fieldErrors`) speaks the same way;
// a message written beside a rule in a schema still wins over these.

/** Words for field names whose key is not plain English. */
const FIELD_WORDS: Record<string, string> = {
	universeId: 'universe',
	receiverId: 'receiver',
	typeId: 'fixture type',
	modeId: 'mode',
	leaderId: 'leader',
	startsOn: 'first day',
	endsOn: 'last day',
	artnetOffset: 'Art-Net numbering',
	transmitterNotes: 'transmitter notes',
	fixtureIds: 'fixtures',
	email: 'e-mail address',
	rcChannels: 'RC channels'
};

/** The field a path points at, in words: ['control', 'universeId'] → "universe". */
export function fieldWord(path: readonly PropertyKey[] | undefined): string {
	const key = [...(path ?? [])].reverse().find((p): p is string => typeof p === 'string' && !/^\d+$/.test(p));
	if (!key) return 'this value';
	// own keys only: a field named `constructor` must not read Object.prototype's
	if (Object.hasOwn(FIELD_WORDS, key)) return FIELD_WORDS[key];
	return key.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
// "a universe", "an Art-Net numbering": the sound decides, not the letter
const article = (s: string) => (/^[aeio]|^u(?!ni|se)/i.test(s) ? `an ${s}` : `a ${s}`);
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

type RawIssue = Parameters<z.core.$ZodErrorMap>[0];

/** The sentence for one zod issue. */
export function humanMessage(issue: RawIssue): string {
	const word = fieldWord(issue.path);
	const Word = capital(word);
	switch (issue.code) {
		case 'invalid_type': {
			const missing = issue.input === undefined || issue.input === null || issue.input === '';
			// a reference to another row is picked from a list, not typed
			const picked = /Id$/.test(String(issue.path?.at(-1) ?? ''));
			if (missing) return picked ? `Pick ${article(word)}.` : `${Word} is required.`;
			const format = (issue.inst as { _zod?: { def?: { format?: string } } } | undefined)?._zod?.def?.format;
			if (issue.expected === 'int' || (issue.expected === 'number' && /int/.test(format ?? '')))
				return `${Word} must be a whole number.`;
			if (issue.expected === 'number') return `${Word} must be a number.`;
			if (issue.expected === 'string') return `${Word} must be text.`;
			if (issue.expected === 'boolean') return `${Word} must be yes or no.`;
			if (issue.expected === 'array') return `${Word} must be a list.`;
			if (issue.expected === 'object' || issue.expected === 'record') return `${Word} is not in the expected form.`;
			return `${Word} is not valid.`;
		}
		case 'too_big': {
			const max = Number(issue.maximum);
			if (issue.origin === 'string') return `${Word} is too long — ${plural(max, 'character')} at most.`;
			if (issue.origin === 'array' || issue.origin === 'set') return `${Word}: ${max} at most.`;
			return `${Word} is at most ${max}.`;
		}
		case 'too_small': {
			const min = Number(issue.minimum);
			if (issue.origin === 'string')
				return min <= 1 ? `${Word} is required.` : `${Word} is too short — at least ${plural(min, 'character')}.`;
			if (issue.origin === 'array' || issue.origin === 'set')
				return min <= 1 ? `Add at least one ${word.replace(/s$/, '')}.` : `${Word}: at least ${min}.`;
			return `${Word} is at least ${min}.`;
		}
		case 'invalid_value':
		case 'invalid_union':
			return `Pick ${article(word)}.`;
		case 'invalid_format':
			if (issue.format === 'email') return 'Enter an e-mail address like name@example.com.';
			return `${Word} is not in the right form.`;
		case 'not_multiple_of':
			return `${Word} must be a multiple of ${String(issue.divisor)}.`;
		case 'unrecognized_keys':
			return `Unknown ${issue.keys.length === 1 ? 'field' : 'fields'}: ${issue.keys.join(', ')}.`;
		case 'invalid_key':
		case 'invalid_element':
			return `${Word} has an entry that is not valid.`;
		default:
			return `${Word} is not valid.`;
	}
}

z.config({ customError: humanMessage });
