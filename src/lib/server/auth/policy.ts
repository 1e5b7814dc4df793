import { zxcvbn, zxcvbnOptions } from '@zxcvbn-ts/core';
import { adjacencyGraphs, dictionary } from '@zxcvbn-ts/language-common';
import { InvalidError } from '../errors';

// Password strength from zxcvbn-ts with its bundled list of common and breached passwords;
// nothing goes over the network. Score 3 ("safely unguessable: moderate protection from offline
// slow-hash attack") is the bar; at least 10 characters is checked first by the schema.
zxcvbnOptions.setOptions({ dictionary, graphs: adjacencyGraphs });

export function passwordProblem(password: string, userInputs: string[] = []): string | null {
	if (password.length < 10) return 'Use at least 10 characters.';
	const result = zxcvbn(password, userInputs);
	if (result.score >= 3) return null;
	const hint = result.feedback.warning ? ` (${result.feedback.warning})` : '';
	return `That password is too easy to guess${hint}. Try a few unrelated words.`;
}

/** Throws InvalidError naming `field` when the password is too weak. */
export function assertStrongPassword(password: string, userInputs: string[] = [], field = 'password'): void {
	const problem = passwordProblem(password, userInputs);
	if (problem) throw new InvalidError(problem, [{ path: [field], message: problem }]);
}
