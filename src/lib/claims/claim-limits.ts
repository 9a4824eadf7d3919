/** A claim's limits, exported once for the zod schema, the claim form and the filters. */
export { MAX_DIMENSION, MIN_DIMENSION } from '$lib/certify/bases';

export const TITLE_MAX_LENGTH = 200;
export const SOURCE_DESCRIPTION_MAX_LENGTH = 5000;
export const MANUSCRIPT_REFERENCE_MAX_LENGTH = 300;
/** The search text of the claim list and the archive. */
export const SEARCH_MAX_LENGTH = 200;
