import { error, json } from '@sveltejs/kit';
import { devPagesEnabled, mailSinkDir } from '$lib/server/config';
import { readCaughtMail } from '$lib/server/mail/sink';

// What the local SMTP sink caught; absent in production.
export const GET = () => {
	if (!devPagesEnabled()) error(404, { message: 'Not found.' });
	return json(readCaughtMail(mailSinkDir()));
};
