/**
 * Errors that services throw and routes translate: NotFoundError → 404 (also for anything of
 * another group, so ids do not leak), ForbiddenError → 403 (a role check inside the user's own
 * group). Bad input is the engine's InputError (→ 400).
 */
export class NotFoundError extends Error {
	constructor(message = 'Not found.') {
		super(message);
		this.name = 'NotFoundError';
	}
}

export class ForbiddenError extends Error {
	constructor(message = 'You may not do that.') {
		super(message);
		this.name = 'ForbiddenError';
	}
}

/** The request is sound but the thing is not in a state that allows it (no counts yet, …). */
export class ConflictError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'ConflictError';
	}
}
