import { json } from '@sveltejs/kit';
import { withBodyRefusals } from './body-refusals';
import { openApiDocument } from './document';

const document = withBodyRefusals(openApiDocument);

/** Public: the description of the API, not its data. */
export const GET = () => json(document);
