/**
 * How many numbers the tables of one counts file may hold in memory (counts, accidentals and
 * durations together, d² per table and kind). A parser takes from this budget before it builds
 * a table, so a small file cannot make it allocate gigabytes (one CSV row per basis of d = 1 024
 * would otherwise ask for a million cells each). The default fits 8 complete tables of
 * d = 1 024, more than a 20 MiB file can fill.
 */
export const MAX_TABLE_NUMBERS = 8 * 1024 * 1024;

const grouped = (n: number) => n.toLocaleString('en-US').replace(/,/g, ' ');

export class TableBudget {
	private used = 0;
	constructor(private readonly limit = MAX_TABLE_NUMBERS) {}

	/** Takes `numbers` cells for a table or matrix; false (nothing taken) when they do not fit. */
	take(numbers: number): boolean {
		if (this.used + numbers > this.limit) return false;
		this.used += numbers;
		return true;
	}

	/** What a refusal says, after the place it names. */
	get refusal(): string {
		return (
			`the file's tables would hold more than ${grouped(this.limit)} numbers (counts, ` +
			'accidentals and durations together, d² each; that is 8 tables of d = 1 024)'
		);
	}

	/** Numbers taken so far (tests read how much a parser reserved). */
	get taken(): number {
		return this.used;
	}
}
