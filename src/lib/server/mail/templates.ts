import type { OutgoingMail } from './outbox';

// Every mail has a plain-text part (read on a phone in a truck) and a simple
// HTML part; links are absolute, built from PUBLIC_BASE_URL.

export function escapeHtml(value: string): string {
	return value
		.replaceAll('&', '&amp;')
		.replaceAll('<', '&lt;')
		.replaceAll('>', '&gt;')
		.replaceAll('"', '&quot;')
		.replaceAll("'", '&#39;');
}

interface MailBody {
	to: string;
	subject: string;
	lines: string[];
	action?: { label: string; url: string };
	footer?: string;
}

export function composeMail({ to, subject, lines, action, footer }: MailBody): OutgoingMail {
	const text = [
		...lines,
		...(action ? ['', `${action.label}: ${action.url}`] : []),
		'',
		footer ?? 'Patchwright — patch planning for lighting crews'
	].join('\n');
	const html = `<!doctype html><html><body style="font-family:'IBM Plex Sans',system-ui,sans-serif;color:#1c2024;max-width:560px">
${lines.map((l) => `<p>${escapeHtml(l)}</p>`).join('\n')}
${action ? `<p><a href="${escapeHtml(action.url)}" style="display:inline-block;padding:10px 16px;background:#225ea8;color:#fafaf6;border-radius:6px;text-decoration:none">${escapeHtml(action.label)}</a></p><p style="font-size:12px;color:#60686e">${escapeHtml(action.url)}</p>` : ''}
<p style="font-size:12px;color:#60686e">${escapeHtml(footer ?? 'Patchwright — patch planning for lighting crews')}</p>
</body></html>`;
	return { to, subject, text, html };
}

export function signInLinkMail(to: string, url: string): OutgoingMail {
	return composeMail({
		to,
		subject: 'Your Patchwright sign-in link',
		lines: [
			'Use this link to sign in to Patchwright. It works once and expires in 24 hours.',
			'If you did not ask for it, ignore this mail.'
		],
		action: { label: 'Sign in', url }
	});
}

/**
 * Words a person typed (a project name, a note, a comment) quoted on a line of their own and
 * named as theirs, so a phishing line in a project name reads as what it is. Line breaks are
 * flattened and the length capped.
 */
export function sendersWords(label: string, value: string): string {
	const flat = value
		.replace(/[\r\n\t\u2028\u2029]+/g, ' ')
		.trim()
		.slice(0, 200);
	return `${label} (written by the sender, not by Patchwright): “${flat}”`;
}

export function invitationMail(
	to: string,
	projectName: string,
	role: string,
	invitedBy: string,
	url: string
): OutgoingMail {
	return composeMail({
		to,
		// no user-chosen text in the subject: it is what a phishing mail would lead with
		subject: 'You are invited to a project on Patchwright',
		lines: [
			`${invitedBy} invited ${to} to a Patchwright project as ${role}.`,
			sendersWords('Project name', projectName),
			'Open the link, sign in (or create an account) with this e-mail address and confirm it; then the project appears in your list.',
			'If you do not know the sender, ignore this mail: nothing happens unless you accept.'
		],
		action: { label: 'See the invitation', url }
	});
}

export function signUpMail(to: string, url: string): OutgoingMail {
	return composeMail({
		to,
		subject: 'Confirm your e-mail address for Patchwright',
		lines: [
			'Someone (we hope you) asked to create a Patchwright account with this address.',
			'Open the link and confirm to finish. It works once and expires in 24 hours.',
			'If it was not you, ignore this mail: no account is made.'
		],
		action: { label: 'Confirm my address', url }
	});
}

export function passwordMail(to: string, url: string, reason: 'signup' | 'reset'): OutgoingMail {
	return composeMail({
		to,
		subject: 'Set your Patchwright password',
		lines: [
			reason === 'signup'
				? 'Someone asked to create a Patchwright account with this address, but you already have one.'
				: 'Someone (we hope you) asked to set a new password for your Patchwright account.',
			'To choose a new password, open the link. It works once and expires in 1 hour.',
			'If it was not you, ignore this mail: your password stays as it is.'
		],
		action: { label: 'Choose a password', url }
	});
}

const MAX_CHANGE_LINES = 30;

function changeLines(changes: { since: number; lines: string[] } | null | undefined): string[] {
	if (!changes) return [];
	if (changes.lines.length === 0) return [`No change to the plan since revision ${changes.since}.`];
	const shown = changes.lines.slice(0, MAX_CHANGE_LINES);
	const more = changes.lines.length - shown.length;
	return [
		`Changes to the plan since revision ${changes.since}:`,
		...shown.map((l) => `• ${l}`),
		...(more > 0 ? [`…and ${more} more on the revisions page.`] : [])
	];
}

export function signoffMail(
	to: string,
	input: {
		projectName: string;
		revision: number;
		note: string;
		decision: 'approved' | 'changes-requested';
		name: string;
		comment: string;
		url: string;
		/** What changed since the last approval, in the words of the review page (describeChanges). */
		changes?: { since: number; lines: string[] } | null;
	}
): OutgoingMail {
	const verdict = input.decision === 'approved' ? 'approved' : 'asked for changes to';
	return composeMail({
		to,
		subject: `Revision ${input.revision} ${input.decision === 'approved' ? 'approved' : 'changes requested'} on Patchwright`,
		lines: [
			`A reviewer ${verdict} revision ${input.revision} of a project you plan.`,
			sendersWords('Project name', input.projectName),
			sendersWords('Reviewer’s name', input.name),
			...(input.note ? [sendersWords('Revision note', input.note)] : []),
			input.comment ? sendersWords('Comment', input.comment) : 'No comment was left.',
			...changeLines(input.changes)
		],
		action: { label: 'Open the revisions', url: input.url }
	});
}

export function reviewLinkMail(
	to: string,
	input: { projectName: string; revision: number | 'latest'; sentBy: string; expiresAt: Date | null; url: string }
): OutgoingMail {
	const what = input.revision === 'latest' ? 'the latest revision' : `revision ${input.revision}`;
	return composeMail({
		to,
		subject: 'Please review a lighting patch on Patchwright',
		lines: [
			`${input.sentBy} asks you to review ${what} of a lighting patch.`,
			sendersWords('Project name', input.projectName),
			'Open the link on your phone or computer; no account is needed. You can approve it or ask for changes.',
			input.expiresAt
				? `The link works until ${input.expiresAt.toISOString().slice(0, 10)}.`
				: 'The link works until it is revoked.',
			'Anyone with the link can read this revision, so please do not forward it.'
		],
		action: { label: 'Review the patch', url: input.url }
	});
}

/** To the holder of an "always the latest" link: the token is not stored, so the mail points at the link they have. */
export function newRevisionMail(
	to: string,
	input: { projectName: string; revision: number; note: string; changes?: { since: number; lines: string[] } | null }
): OutgoingMail {
	return composeMail({
		to,
		subject: `Patchwright: revision ${input.revision} is ready to review`,
		lines: [
			`Revision ${input.revision} of a lighting patch you review is ready.`,
			sendersWords('Project name', input.projectName),
			...(input.note ? [sendersWords('Revision note', input.note)] : []),
			'Open the review link you were sent earlier: it always shows the latest revision, and you can approve it or ask for changes there.',
			...changeLines(input.changes)
		]
	});
}
