/**
 * ORCID iDs: sixteen characters in four groups of four, the last a check character computed with
 * ISO/IEC 7064:2003 MOD 11-2 over the first fifteen digits ('X' stands for ten). Source: ORCID's
 * support article "Structure of the ORCID Identifier" and its checksum worksheet. Browser-safe.
 */

const SHAPE = /^(\d{4})-?(\d{4})-?(\d{4})-?(\d{3}[\dX])$/;

/** The MOD 11-2 check character of fifteen digits. */
export function orcidCheckCharacter(digits: string): string {
	let total = 0;
	for (const digit of digits) total = (total + Number(digit)) * 2;
	const result = (12 - (total % 11)) % 11;
	return result === 10 ? 'X' : String(result);
}

/** The iD as 0000-0002-1825-0097 when the text is one (with or without hyphens or the URL), else null. */
export function parseOrcid(text: string): string | null {
	const bare = text
		.trim()
		.replace(/^https?:\/\/(www\.)?(sandbox\.)?orcid\.org\//i, '')
		.toUpperCase();
	const match = SHAPE.exec(bare);
	if (!match) return null;
	const digits = match.slice(1).join('');
	if (orcidCheckCharacter(digits.slice(0, 15)) !== digits[15]) return null;
	return match.slice(1).join('-');
}

/** Why a text is not an ORCID iD, in words for a form; null when it is one. */
export function orcidProblem(text: string): string | null {
	const bare = text.trim();
	if (!bare) return 'Give an ORCID iD.';
	if (!SHAPE.test(bare.replace(/^https?:\/\/(www\.)?(sandbox\.)?orcid\.org\//i, '').toUpperCase()))
		return 'An ORCID iD has sixteen characters in four groups of four, e.g. 0000-0002-1825-0097.';
	return parseOrcid(bare)
		? null
		: 'That ORCID iD has a wrong check character (its last one): check it for a typing slip.';
}

/** The iD as ORCID asks it to be shown: the full https URL. */
export const orcidUrl = (orcid: string): string => `https://orcid.org/${orcid}`;
