/**
 * The fake ORCID's sign-in page: choose one of the demo's invented iDs or type any valid iD
 * (with names), and the provider signs the person in with that iD as `sub`. Local use only.
 */
import type { IncomingMessage, ServerResponse } from 'node:http';
import type Provider from 'oidc-provider';
import { orcidProblem, parseOrcid } from '$lib/orcid-id';
import { DEMO_ORCID_PEOPLE } from '../demo/orcid-people';

type FakeNames = { given_name?: string; family_name?: string; name?: string };
/** Names the fake hands out per iD, as typed on its page. */
export type FakePeople = Map<string, FakeNames>;

const escape = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function page(uid: string, problem: string | null, typed: Record<string, string>): string {
	const people = DEMO_ORCID_PEOPLE.map(
		(p) =>
			`<li><button name="pick" value="${p.orcid}">${escape(`${p.givenName} ${p.familyName}`)} · ${p.orcid}</button> <small>${escape(p.note)}</small></li>`
	).join('');
	const field = (name: string, label: string) =>
		`<label>${label} <input name="${name}" value="${escape(typed[name] ?? '')}"></label>`;
	return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Fake ORCID sign-in (local test provider)</title>
<style>body{font:16px/1.5 system-ui,sans-serif;max-width:40rem;margin:2rem auto;padding:0 1rem;color:#222}
h1{font-size:1.4rem}label{display:block;margin:.5rem 0}input{font:inherit;padding:.2rem .4rem;width:14rem}
.problem{border-left:4px solid #a33;padding:.3rem .8rem;background:#fbeaea}ul{padding-left:1rem}button{font:inherit;margin:.2rem 0}</style>
</head><body><h1>Fake ORCID sign-in</h1>
<p>This is Rankseal's local stand-in for ORCID, for the demo and tests. Nobody's real ORCID account is involved: choose a person, or type an ORCID iD.</p>
${problem ? `<p class="problem" role="alert" id="problem">${escape(problem)}</p>` : ''}
<form method="post" action="/interaction/${uid}">
<h2>Demo people</h2><ul>${people}</ul>
<h2>Any ORCID iD</h2>
${field('orcid', 'ORCID iD')}${field('given_name', 'Given name')}${field('family_name', 'Family name')}
<button name="signin" value="1">Sign in with this iD</button>
<button name="cancel" value="1">Cancel</button>
</form></body></html>`;
}

async function formBody(req: IncomingMessage): Promise<Record<string, string>> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const chunk of req) {
		size += (chunk as Buffer).length;
		if (size > 16_384) throw new Error('form too large');
		chunks.push(chunk as Buffer);
	}
	return Object.fromEntries(new URLSearchParams(Buffer.concat(chunks).toString('utf8')));
}

function send(res: ServerResponse, status: number, html: string): void {
	res.writeHead(status, {
		'content-type': 'text/html; charset=utf-8',
		'cache-control': 'no-store'
	});
	res.end(html);
}

/** The iD and names a submitted form names, or the problem with it. */
function chosen(form: Record<string, string>): { orcid: string; names: FakeNames } | string {
	const demo = DEMO_ORCID_PEOPLE.find((p) => p.orcid === form.pick);
	if (demo)
		return {
			orcid: demo.orcid,
			names: {
				given_name: demo.givenName,
				family_name: demo.familyName,
				name: `${demo.givenName} ${demo.familyName}`
			}
		};
	const orcid = parseOrcid(form.orcid ?? '');
	if (!orcid) return orcidProblem(form.orcid ?? '') ?? 'Give an ORCID iD.';
	const given = (form.given_name ?? '').trim().slice(0, 100);
	const family = (form.family_name ?? '').trim().slice(0, 100);
	const name = `${given} ${family}`.trim();
	return {
		orcid,
		names: {
			given_name: given || undefined,
			family_name: family || undefined,
			name: name || undefined
		}
	};
}

/** GET shows the page; POST signs in with the chosen iD, or cancels (access_denied). */
export async function answerInteraction(
	provider: Provider,
	people: FakePeople,
	req: IncomingMessage,
	res: ServerResponse
): Promise<void> {
	const details = await provider.interactionDetails(req, res);
	if (req.method !== 'POST') return send(res, 200, page(details.uid, null, {}));
	const form = await formBody(req);
	if (form.cancel) {
		const result = {
			error: 'access_denied',
			error_description: 'The person cancelled the sign-in.'
		};
		return provider.interactionFinished(req, res, result, { mergeWithLastSubmission: false });
	}
	const choice = chosen(form);
	if (typeof choice === 'string') return send(res, 400, page(details.uid, choice, form));
	people.set(choice.orcid, choice.names);
	const result = { login: { accountId: choice.orcid } };
	await provider.interactionFinished(req, res, result, { mergeWithLastSubmission: false });
}
