/**
 * The one error mapping: a service error becomes one Problem (status, code, message and where),
 * and that Problem becomes Kit's error() for page loads, fail() with the same keys for every
 * form action, or the API's `{ error: { code, message, field?, line?, column? } }`.
 */
import { error, fail, json, type ActionFailure } from '@sveltejs/kit';
import { ZodError } from 'zod';
import { InputError } from '$lib/certify';
import type { FieldErrors, FormProblem } from '$lib/views/forms';
import {
	ConflictError,
	FieldError,
	ForbiddenError,
	NotFoundError,
	RateLimitedError
} from '../core/errors';

/** One code per kind of problem, the same on every endpoint (and in the OpenAPI document). */
export const PROBLEM_CODES = [
	'bad_input',
	'bad_counts',
	'unauthorised',
	'forbidden',
	'not_found',
	'conflict',
	'too_large',
	'unsupported_media_type',
	'rate_limited',
	'unavailable'
] as const;

export type { FieldErrors, FormProblem } from '$lib/views/forms';

export type ProblemCode = (typeof PROBLEM_CODES)[number];

export interface Problem {
	status: number;
	code: ProblemCode;
	message: string;
	/** The form or body field at fault, for bad_input. */
	field?: string;
	/** Where in a counts file, for bad_counts. */
	line?: number;
	column?: number;
	retryAfterSeconds?: number;
}

/** An HTTP-level refusal raised by the API's own helpers (401, 413, 415, unreadable bodies). */
export class ApiError extends Error {
	constructor(
		readonly status: number,
		readonly code: ProblemCode,
		message: string,
		readonly field?: string
	) {
		super(message);
		this.name = 'ApiError';
	}
}

/** "title: Give the claim a title.; dimension: …" — every issue with the field it concerns. */
export function describeIssues(problem: ZodError): string {
	return problem.issues
		.map((i) => (i.path.length ? `${i.path.join('.')}: ${i.message}` : i.message))
		.join('; ');
}

/** The Problem for a known service error; null for anything else (a bug: let it be a 500). */
export function problemOf(e: unknown): Problem | null {
	if (e instanceof ApiError)
		return { status: e.status, code: e.code, message: e.message, field: e.field };
	if (e instanceof NotFoundError) return { status: 404, code: 'not_found', message: e.message };
	if (e instanceof ForbiddenError) return { status: 403, code: 'forbidden', message: e.message };
	if (e instanceof FieldError)
		return { status: 400, code: 'bad_input', message: e.message, field: e.field };
	if (e instanceof ZodError) {
		const path = e.issues[0]?.path ?? [];
		const field = path.length ? String(path[0]) : undefined;
		return { status: 400, code: 'bad_input', message: describeIssues(e), field };
	}
	if (e instanceof InputError)
		return { status: 400, code: 'bad_counts', message: e.message, line: e.line, column: e.column };
	if (e instanceof ConflictError) return { status: 409, code: 'conflict', message: e.message };
	if (e instanceof RateLimitedError)
		return {
			status: 429,
			code: 'rate_limited',
			message: e.message,
			// Every 429 says when to try again (RFC 6585 §4): a second when the service named no wait.
			retryAfterSeconds: e.retryAfterSeconds ?? 1
		};
	return null;
}

const known = (e: unknown): Problem => {
	const problem = problemOf(e);
	if (!problem) throw e;
	return problem;
};

/** The Retry-After header a problem's answer carries (a 429's), or none. */
export function retryHeaders(problem: Problem | null): Record<string, string> {
	const seconds = problem?.retryAfterSeconds;
	return seconds === undefined ? {} : { 'retry-after': String(seconds) };
}

/** The API's JSON answer for a problem. */
export function problemResponse(problem: Problem): Response {
	const { status, code, message, field, line, column } = problem;
	const headers = retryHeaders(problem);
	return json({ error: { code, message, field, line, column } }, { status, headers });
}

/** A service error as the API's JSON answer; unknown errors are rethrown. */
export const apiProblem = (e: unknown): Response => problemResponse(known(e));

/** A service error during a page load: Kit's error page with our code. Never returns. */
export function pageProblem(e: unknown): never {
	const { status, code, message } = known(e);
	error(status, { message, code });
}

/** The first message per field of a failed zod parse ('' for errors about the whole form). */
export function fieldErrors(problem: ZodError): FieldErrors {
	const errors: FieldErrors = {};
	for (const issue of problem.issues) {
		const key = issue.path.length ? String(issue.path[0]) : '';
		errors[key] ??= issue.message;
	}
	return errors;
}

/**
 * A service error in a form action: fail() beside the form, the same keys for every action.
 * Something not visible stays a 404 page, as a load would answer; unknown errors are rethrown.
 */
export function formFailure(
	action: string,
	e: unknown,
	values: Record<string, string> = {}
): ActionFailure<FormProblem> {
	const problem = known(e);
	if (problem.code === 'not_found') error(404, { message: problem.message, code: problem.code });
	const errors =
		e instanceof ZodError
			? fieldErrors(e)
			: { [problem.field ?? (problem.code === 'bad_counts' ? 'counts' : '')]: problem.message };
	const place =
		problem.code === 'bad_counts'
			? { line: problem.line ?? null, column: problem.column ?? null }
			: null;
	return fail(problem.status, { action, errors, values, place });
}
