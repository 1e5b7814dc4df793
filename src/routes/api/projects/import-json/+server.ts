import { json } from '@sveltejs/kit';
import { api, ApiError } from '$lib/server/api';
import { requireUser } from '$lib/server/authz';
import { checkBackup, restoreBackup } from '$lib/server/import/json';
import { MAX_UPLOAD_BYTES } from '$lib/server/import/limits';
import { readCapped, readUpload } from '$lib/server/import/multipart';
import type { RequestHandler } from './$types';

/** A project export (JSON body, or multipart field `file`) becomes a NEW project owned by the caller: 201 with the project. */
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
	// decoding and checking run in a worker thread with a time and heap budget; only the writes run here
	return json(restoreBackup(user.id, await checkBackup(bytes)), { status: 201 });
});
