/**
 * A certificate's DOI: the configured prefix and a suffix made from the certificate id, so it is
 * known at issue time (PDF, page, /seal, JSON) before the registry has heard of it.
 */
import { config } from '../core/config';

/** DOI names compare case-insensitively (DOI Handbook §2.4, from memory): store them lower-case. */
export const doiFor = (certificateId: string, prefix = config().datacite.prefix): string =>
	`${prefix}/rankseal.${certificateId}`.toLowerCase();

let liveResolver: string | null = null;

/** The running app sets this to the local fake registry's address when it uses the fake. */
export function setDoiResolver(resolver: string | null): void {
	liveResolver = resolver;
}

/** The address that resolves the DOI (https://doi.org/… with a real registry). */
export const doiLink = (doi: string): string => {
	const resolver = liveResolver ?? config().datacite.resolver;
	return `${resolver.endsWith('/') ? resolver : `${resolver}/`}${doi}`;
};
