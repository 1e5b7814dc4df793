import { createHash, randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { and, asc, eq } from 'drizzle-orm';
import { NotFoundError, TooLargeError, UnsupportedTypeError } from '../errors';
import { uploadsDir } from '../config';
import { recordAudit } from './audit';
import { db } from './index';
import { uploads } from './schema';

export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;

export type UploadRow = typeof uploads.$inferSelect;

/** Decides the type from the first bytes: a name or a declared type proves nothing. */
export function sniffImage(bytes: Uint8Array): { mime: string; ext: string } | null {
	const b = bytes;
	if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return { mime: 'image/jpeg', ext: 'jpg' };
	const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
	if (b.length >= 8 && png.every((v, i) => b[i] === v)) return { mime: 'image/png', ext: 'png' };
	const ascii = (from: number, to: number) => String.fromCharCode(...b.subarray(from, to));
	if (b.length >= 12 && ascii(0, 4) === 'RIFF' && ascii(8, 12) === 'WEBP') return { mime: 'image/webp', ext: 'webp' };
	return null;
}

export function photoShape(projectId: number, u: UploadRow) {
	return {
		id: u.id,
		fixtureId: u.fixtureId,
		mime: u.mime,
		bytes: u.bytes,
		originalName: u.originalName,
		createdAt: u.createdAt.toISOString(),
		url: `/api/projects/${projectId}/fixtures/${u.fixtureId}/photos/${u.id}`
	};
}
export type PhotoShape = ReturnType<typeof photoShape>;

export function listPhotos(projectId: number, fixtureId: number): PhotoShape[] {
	return db()
		.select()
		.from(uploads)
		.where(and(eq(uploads.projectId, projectId), eq(uploads.fixtureId, fixtureId)))
		.orderBy(asc(uploads.createdAt), asc(uploads.id))
		.all()
		.map((u) => photoShape(projectId, u));
}

function photoRow(projectId: number, fixtureId: number, id: number): UploadRow {
	const row = db()
		.select()
		.from(uploads)
		.where(and(eq(uploads.id, id), eq(uploads.projectId, projectId), eq(uploads.fixtureId, fixtureId)))
		.get();
	if (!row) throw new NotFoundError('No such photo.');
	return row;
}

/** Writes the file first (under a random name), then the row; a failed insert removes the file. */
export function addPhoto(
	projectId: number,
	userId: string,
	fixtureId: number,
	bytes: Uint8Array,
	originalName: string
): PhotoShape {
	if (bytes.byteLength > MAX_PHOTO_BYTES) throw new TooLargeError('Photos are limited to 10 MB.');
	const kind = sniffImage(bytes);
	if (!kind) throw new UnsupportedTypeError('Send a JPEG, PNG or WebP image.');
	const dir = uploadsDir();
	mkdirSync(dir, { recursive: true });
	const storedName = `${randomBytes(16).toString('hex')}.${kind.ext}`;
	writeFileSync(join(dir, storedName), bytes, { flag: 'wx' });
	try {
		return db().transaction(() => {
			const row = db()
				.insert(uploads)
				.values({
					projectId,
					fixtureId,
					storedName,
					originalName: originalName.slice(0, 200),
					mime: kind.mime,
					bytes: bytes.byteLength,
					sha256: createHash('sha256').update(bytes).digest('hex'),
					uploadedBy: userId
				})
				.returning()
				.get();
			const shape = photoShape(projectId, row);
			recordAudit({ projectId, userId, action: 'photo.add', entity: 'upload', entityId: row.id, after: shape });
			return shape;
		});
	} catch (err) {
		rmSync(join(dir, storedName), { force: true });
		throw err;
	}
}

export function readPhoto(projectId: number, fixtureId: number, id: number): { row: UploadRow; bytes: Buffer } {
	const row = photoRow(projectId, fixtureId, id);
	return { row, bytes: readFileSync(join(uploadsDir(), row.storedName)) };
}

export function deletePhoto(projectId: number, userId: string, fixtureId: number, id: number): void {
	const row = db().transaction(() => {
		const r = photoRow(projectId, fixtureId, id);
		db().delete(uploads).where(eq(uploads.id, id)).run();
		recordAudit({
			projectId,
			userId,
			action: 'photo.delete',
			entity: 'upload',
			entityId: id,
			before: photoShape(projectId, r)
		});
		return r;
	});
	removeStoredFiles([row.storedName]);
}

export function removeStoredFiles(names: string[]): void {
	for (const n of names) rmSync(join(uploadsDir(), n), { force: true });
}
