import type { RequestEvent } from '@sveltejs/kit';
import { InvalidError, TooLargeError, UnsupportedTypeError, type Issue } from './errors';

// Request bodies read with a running byte count: JSON, photos and imports all come through here.

function sizeText(bytes: number): string {
	return bytes >= 1024 * 1024 ? `${Math.floor(bytes / 1024 / 1024)} MB` : `${bytes} bytes`;
}

/** past this the rest of an oversized body is not worth reading just to answer politely */
const DRAIN_BYTES = 32 * 1024 * 1024;

/**
 * The body up to `limit` bytes. Past the limit nothing more is kept, but the rest is read and
 * dropped (up to DRAIN_BYTES) before answering 413: closing a socket with unread data makes
 * TCP reset it, and the client would see a reset instead of the answer.
 */
export async function readCapped(request: Request, limit: number): Promise<Uint8Array> {
	const declared = Number(request.headers.get('content-length') ?? 0);
	const tooLarge = () => new TooLargeError(`The request body is over ${sizeText(limit)}.`);
	if (declared > DRAIN_BYTES) throw tooLarge();
	if (!request.body) return new Uint8Array(0);
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		let step: ReadableStreamReadResult<Uint8Array>;
		try {
			step = await reader.read();
		} catch {
			// the adapter's own BODY_SIZE_LIMIT or a dropped client ends the stream
			if (size > limit) throw tooLarge();
			throw new InvalidError('The upload was cut off.');
		}
		if (step.done) break;
		size += step.value.byteLength;
		if (size > DRAIN_BYTES) {
			await reader.cancel();
			throw tooLarge();
		}
		if (size <= limit) chunks.push(step.value);
	}
	if (size > limit) throw tooLarge();
	const out = new Uint8Array(size);
	let at = 0;
	for (const c of chunks) {
		out.set(c, at);
		at += c.length;
	}
	return out;
}

export interface Upload {
	name: string;
	bytes: Uint8Array;
	fields: Map<string, string>;
}

export interface UploadLimits {
	/** the whole multipart body, framing included */
	maxBodyBytes: number;
	maxFileBytes: number;
	/** how a missing file is reported in `issues` (imports name rows, the rest name paths) */
	missingIssue: Issue;
}

/** The multipart field `file` and the other text fields; the body is counted while read and refused (413) past the cap. */
export async function readUpload(event: Pick<RequestEvent, 'request'>, limits: UploadLimits): Promise<Upload> {
	const type = event.request.headers.get('content-type') ?? '';
	if (!type.startsWith('multipart/form-data'))
		throw new UnsupportedTypeError('Send the file as multipart/form-data with a field named file.');
	const body = await readCapped(event.request, limits.maxBodyBytes);
	let form: FormData;
	try {
		form = await new Request('http://upload.invalid/', {
			method: 'POST',
			headers: { 'content-type': type },
			body: new Uint8Array(body)
		}).formData();
	} catch {
		throw new InvalidError('The multipart body could not be read.');
	}
	const file = form.get('file');
	if (!(file instanceof File)) throw new InvalidError('Attach the file in a field named file.', [limits.missingIssue]);
	if (file.size > limits.maxFileBytes) throw new TooLargeError(`The file is over ${sizeText(limits.maxFileBytes)}.`);
	const fields = new Map<string, string>();
	for (const [k, v] of form) if (typeof v === 'string') fields.set(k, v);
	return { name: file.name, bytes: new Uint8Array(await file.arrayBuffer()), fields };
}
