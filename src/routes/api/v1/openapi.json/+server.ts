import { json } from '@sveltejs/kit';
import { openApiDocument } from './document';

/** Public: the description of the API, not its data. */
export const GET = () => json(openApiDocument);
