import { error, json } from '@sveltejs/kit';
import { devPagesEnabled, mailSinkDir } from '$lib/server/config';
import { readCaughtMail } from '$lib/server/mail/sink';
import type { RequestHandler } from './$types';

// What the local SMTP sink caught; absent in production and to other machines.
export const GET: RequestHandler = ({ getClientAddress }) => {
	if (!devPagesEnabled(getClientAddress())) error(404, { message: 'Not found.' });
	return json(readCaughtMail(mailSinkDir()));
};
