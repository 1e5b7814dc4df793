/** A write carried a `version` older than the row's: the caller must re-read. */
export class StaleVersionError extends Error {
	constructor(public current: unknown) {
		super('Someone else changed this since you read it.');
	}
}

/** A delete or change refused because other rows depend on the target. */
export class InUseError extends Error {
	constructor(
		message: string,
		public usedBy: unknown[]
	) {
		super(message);
	}
}
