import { json } from '@sveltejs/kit';
import { api, ApiError } from '$lib/server/api';
import { requireUser } from '$lib/server/authz';
import { previewRestore, restoreRenamed } from '$lib/server/import/restore';
import { MAX_UPLOAD_BYTES, sniff } from '$lib/server/import/limits';
import { readCapped, readUpload } from '$lib/server/import/multipart';
import type { RequestHandler } from './$types';

/**
 * A project export (JSON body, or multipart field `file`) becomes a NEW project owned by the caller,
 * named "<name> (restored <date>)": 201 with the project. With `?preview=true` nothing is written:
 * 200 with what would be created (counts) or the problems that stop it.
 */
export const POST: RequestHandler = api(async (event) => {
	const user = requireUser(event);
	const type = event.request.headers.get('content-type') ?? '';
	const bytes = type.startsWith('multipart/form-data')
		? (await readUpload(event)).bytes
		: type.includes('application/json')
			? await readCapped(event.request, MAX_UPLOAD_BYTES)
			: null;
	if (!bytes)
		throw new ApiError(
			415,
			'Send the project export as application/json or multipart/form-data with a field named file.'
		);
	if (sniff(bytes) !== 'json') throw new ApiError(415, 'The file is not a JSON project export.');
	if (event.url.searchParams.get('preview') === 'true') return json(await previewRestore(user.id, bytes));
	return json(await restoreRenamed(user.id, bytes), { status: 201 });
});
