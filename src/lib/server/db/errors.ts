// Kept for existing imports: the error model lives in src/lib/server/errors.ts.
export { InUseError, StaleVersionError } from '../errors';
