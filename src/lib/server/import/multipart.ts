import type { RequestEvent } from '@sveltejs/kit';
import { ApiError, readLimitedBytes } from '../api';
import { MAX_FORM_BYTES, MAX_UPLOAD_BYTES } from './limits';

export interface Upload {
	name: string;
	bytes: Uint8Array;
	fields: Map<string, string>;
}

/** The multipart field `file` and the other text fields; the body is counted while read and refused (413) past the cap. */
export async function readUpload(event: Pick<RequestEvent, 'request'>): Promise<Upload> {
	const type = event.request.headers.get('content-type') ?? '';
	if (!type.startsWith('multipart/form-data')) throw new ApiError(415, 'Send the file as multipart/form-data with a field named file.');
	const body = await readLimitedBytes(event.request, MAX_FORM_BYTES);
	let form: FormData;
	try {
		form = await new Request('http://upload.invalid/', { method: 'POST', headers: { 'content-type': type }, body: new Uint8Array(body) }).formData();
	} catch {
		throw new ApiError(400, 'The multipart body could not be read.');
	}
	const file = form.get('file');
	if (!(file instanceof File)) throw new ApiError(400, 'Attach the file in a field named file.', { issues: [{ row: null, field: 'file', message: 'Missing.' }] });
	if (file.size > MAX_UPLOAD_BYTES) throw new ApiError(413, `The file is over ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.`);
	const fields = new Map<string, string>();
	for (const [k, v] of form) if (typeof v === 'string') fields.set(k, v);
	return { name: file.name, bytes: new Uint8Array(await file.arrayBuffer()), fields };
}
