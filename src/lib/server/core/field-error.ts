/** A rule broken by otherwise well-formed input (address taken, last lead): shown beside a field. */
export class FieldError extends Error {
	constructor(
		readonly field: string,
		message: string
	) {
		super(message);
		this.name = 'FieldError';
	}
}
