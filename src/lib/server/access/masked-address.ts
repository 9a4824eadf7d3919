/**
 * An e-mail address as shown to someone who may not be its owner: enough for the owner to tell
 * which of their addresses it is, not enough for anyone else to write to it.
 */

/** "tor@basalt.example" → "t***@b***.example": first letters and the last domain label only. */
export function maskedAddress(email: string): string {
	const at = email.lastIndexOf('@');
	const local = at > 0 ? email.slice(0, at) : email;
	const domain = at > 0 ? email.slice(at + 1) : '';
	const hide = (part: string) => `${part.slice(0, 1)}***`;
	const labels = domain.split('.');
	// A fixed number of stars, so that the mask does not tell the length either.
	const shownDomain =
		labels.length > 1 ? `${hide(labels.slice(0, -1).join('.'))}.${labels.at(-1)}` : hide(domain);
	return `${hide(local)}@${shownDomain}`;
}
