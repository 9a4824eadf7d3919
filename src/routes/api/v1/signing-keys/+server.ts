import { json } from '@sveltejs/kit';
import { publishedKeys } from '$lib/server/evidence/keys';
import type { RequestHandler } from './$types';

/** Public: every key the service has signed with, in the shape `verify --keys FILE` reads. */
export const GET: RequestHandler = async () => json({ keys: publishedKeys() });
