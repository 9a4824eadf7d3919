/**
 * Process-wide services of the running app: the database, the session manager, the mail
 * transport (and local catcher) and the check runner, started once on first use.
 */
import { dev } from '$app/environment';
import { createLucia, type AppLucia } from './auth';
import { config } from './config';
import { db, type Database } from './db';

export interface AppServices {
	database: Database;
	lucia: AppLucia;
}

let services: Promise<AppServices> | null = null;

export function app(): Promise<AppServices> {
	services ??= (async () => {
		const database = await db();
		const lucia = createLucia(database, !dev && config().origin.startsWith('https:'));
		return { database, lucia };
	})();
	return services;
}
