import { randomBytes } from 'node:crypto';
import { closeSync, fsyncSync, mkdirSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { InsufficientStorageError } from './errors';

// Files that must appear whole or not at all: written under a temporary name,
// fsynced, then renamed (rename is atomic within one directory on POSIX).

/** ENOSPC (disk full) and EDQUOT (quota) mean the same to the person uploading. */
export function isOutOfSpace(err: unknown): boolean {
	const code = (err as { code?: string } | null)?.code;
	return code === 'ENOSPC' || code === 'EDQUOT';
}

export function outOfSpace(): InsufficientStorageError {
	return new InsufficientStorageError('The server’s disk is full; nothing was kept. Tell whoever runs the server.');
}

/** Writes `bytes` to a fresh temporary file beside `finalPath` and fsyncs it; returns the temporary path. */
export function writeTemp(finalPath: string, bytes: Uint8Array): string {
	const dir = dirname(finalPath);
	const temp = join(dir, `.tmp-${randomBytes(8).toString('hex')}`);
	try {
		mkdirSync(dir, { recursive: true });
		const fd = openSync(temp, 'wx', 0o600);
		try {
			for (let at = 0; at < bytes.byteLength;) at += writeSync(fd, bytes, at, bytes.byteLength - at);
			fsyncSync(fd);
		} finally {
			closeSync(fd);
		}
	} catch (err) {
		rmSync(temp, { force: true });
		if (isOutOfSpace(err)) throw outOfSpace();
		throw err;
	}
	return temp;
}

/** Moves a temporary file into place and fsyncs its directory so the new name survives power loss. */
export function commitTemp(temp: string, finalPath: string): void {
	try {
		renameSync(temp, finalPath);
		const dirFd = openSync(dirname(finalPath), 'r');
		try {
			fsyncSync(dirFd);
		} finally {
			closeSync(dirFd);
		}
	} catch (err) {
		rmSync(temp, { force: true });
		if (isOutOfSpace(err)) throw outOfSpace();
		throw err;
	}
}
