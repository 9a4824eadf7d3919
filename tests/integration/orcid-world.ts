/**
 * Drives sign-in with ORCID for integration tests: the app's routes are called in-process with a
 * cookie jar standing in for the browser, and the real fake provider (oidc-provider) is spoken to
 * over HTTP with its own jar, through its sign-in page, as a browser would.
 */
import { isHttpError, isRedirect, type Cookies } from '@sveltejs/kit';

/** The app's cookies as SvelteKit hands them to a route (only what the routes use). */
export class AppJar {
	readonly values = new Map<string, string>();
	get = (name: string) => this.values.get(name);
	getAll = () => [...this.values].map(([name, value]) => ({ name, value }));
	set = (name: string, value: string, options: { maxAge?: number }) => {
		if (value === '' || options.maxAge === 0) this.values.delete(name);
		else this.values.set(name, value);
	};
	delete = (name: string) => void this.values.delete(name);
	serialize = () => '';
	get cookies(): Cookies {
		return this as unknown as Cookies;
	}
}

/** What a route returned or threw: a redirect's location, an HTTP error, or the value. */
export async function outcome(
	run: () => unknown
): Promise<{ location?: string; status?: number; message?: string; value?: unknown }> {
	try {
		return { value: await run() };
	} catch (thrown) {
		if (isRedirect(thrown)) return { status: thrown.status, location: thrown.location };
		if (isHttpError(thrown)) return { status: thrown.status, message: thrown.body.message };
		throw thrown;
	}
}

/** A browser's view of the provider: cookies kept per name, redirects followed by hand. */
export class ProviderBrowser {
	private readonly jar = new Map<string, string>();

	async request(url: string, init: RequestInit = {}): Promise<Response> {
		const cookie = [...this.jar].map(([k, v]) => `${k}=${v}`).join('; ');
		const response = await fetch(url, {
			...init,
			redirect: 'manual',
			headers: { ...(init.headers ?? {}), cookie }
		});
		for (const line of response.headers.getSetCookie()) {
			const [pair, ...attributes] = line.split(';');
			const [name, ...rest] = pair.split('=');
			const expired = attributes.some((a) => /expires=Thu, 01 Jan 1970/i.test(a));
			if (expired) this.jar.delete(name.trim());
			else this.jar.set(name.trim(), rest.join('='));
		}
		return response;
	}

	/** Follows the provider's redirects until one leaves it (returned) or a page answers. */
	async follow(url: string, init?: RequestInit): Promise<{ url: string; response: Response }> {
		let response = await this.request(url, init);
		let at = url;
		while (response.status >= 300 && response.status < 400) {
			at = new URL(response.headers.get('location')!, at).href;
			if (new URL(at).origin !== new URL(url).origin) return { url: at, response };
			response = await this.request(at);
		}
		return { url: at, response };
	}
}

export type Choice =
	{ pick: string } | { cancel: '1' } | { orcid: string; given_name?: string; family_name?: string };

/**
 * From the authorisation URL through the fake's sign-in page to the redirect back to the app:
 * the callback URL, or the page (status and text) when the provider answers with one.
 */
export async function signInAtProvider(
	browser: ProviderBrowser,
	authorisationUrl: string,
	choice: Choice
): Promise<{ callback: URL } | { status: number; text: string }> {
	const shown = await browser.follow(authorisationUrl);
	if (shown.response.status !== 200) throw new Error(`provider answered ${shown.response.status}`);
	const page = await shown.response.text();
	const action = /<form method="post" action="([^"]+)"/.exec(page)![1];
	const fields = 'pick' in choice || 'cancel' in choice ? choice : { ...choice, signin: '1' };
	const body = new URLSearchParams(fields as Record<string, string>).toString();
	const headers = { 'content-type': 'application/x-www-form-urlencoded' };
	const sent = await browser.follow(new URL(action, shown.url).href, {
		method: 'POST',
		body,
		headers
	});
	if (sent.response.status >= 300 && sent.response.status < 400)
		return { callback: new URL(sent.url) };
	return { status: sent.response.status, text: await sent.response.text() };
}
