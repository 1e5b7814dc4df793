import type { RequestEvent } from '@sveltejs/kit';
import { readUpload as readAnyUpload, type Upload } from '../body';
import { MAX_FORM_BYTES, MAX_UPLOAD_BYTES } from './limits';

export { readCapped, type Upload } from '../body';

/** An import upload: 20 MB at most; a missing file is reported like a bad row. */
export function readUpload(event: Pick<RequestEvent, 'request'>): Promise<Upload> {
	return readAnyUpload(event, {
		maxBodyBytes: MAX_FORM_BYTES,
		maxFileBytes: MAX_UPLOAD_BYTES,
		missingIssue: { row: null, field: 'file', message: 'Missing.' }
	});
}
