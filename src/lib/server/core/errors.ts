/**
 * The few kinds of failure services throw; src/lib/server/http/problems.ts turns each into one HTTP
 * answer. NotFoundError also covers anything the caller may not see, so ids do not leak;
 * ForbiddenError is for something visible that this caller may not do. Bad input is a
 * FieldError (a field of a form or body) or the engine's InputError (a counts file, by line).
 */
export { FieldError } from './field-error';

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

/**
 * The request is sound but the thing is not in a state that allows it (no counts yet, a repeated
 * upload, a claim already checked): 409.
 */
export class ConflictError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'ConflictError';
	}
}

/** Too many requests of one kind from one caller; retry after the given number of seconds. */
export class RateLimitedError extends Error {
	constructor(
		message: string,
		readonly retryAfterSeconds: number | null = null
	) {
		super(message);
		this.name = 'RateLimitedError';
	}
}
