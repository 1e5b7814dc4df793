import { error } from '@sveltejs/kit';
import { devPagesEnabled, mailSinkDir } from '$lib/server/config';
import { readCaughtMail } from '$lib/server/mail/sink';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ getClientAddress }) => {
	if (!devPagesEnabled(getClientAddress())) error(404, { message: 'Not found.' });
	return { mails: readCaughtMail(mailSinkDir()).map(({ html: _html, ...rest }) => rest) };
};
