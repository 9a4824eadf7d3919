import { redirect } from '@sveltejs/kit';
import { checkRequestSchema } from '$lib/claims/schema';
import { claimOffers } from '$lib/server/access/permissions';
import { app } from '$lib/server/app/app';
import { echoValues, formRefusal, requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure, pageProblem } from '$lib/server/http/problems';
import { listCertificates } from '$lib/server/certificates/certificate-reads';
import { startCheck, listChecks } from '$lib/server/checks/checks';
import { getClaim } from '$lib/server/claims/claims';
import { datasetTables, listDatasets } from '$lib/server/datasets/datasets';
import { addCountsFiles } from '$lib/server/datasets/counts-files';
import { countsFilesOfForm } from '$lib/server/http/counts-form';
import { withUploadSlot } from '$lib/server/datasets/upload-slots';
import { removeDataset } from '$lib/server/datasets/dataset-removal';
import { countsRecord } from '$lib/server/datasets/counts-record';
import { withdrawClaim } from '$lib/server/claims/claim-withdraw';
import { ForbiddenError } from '$lib/server/core/errors';
import { withdrawConfirmSchema } from './withdraw-schema';

const membersOnly = (problem: unknown) => {
	if (problem instanceof ForbiddenError) return null;
	throw problem;
};
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	const claim = await getClaim(database, actor, params.id).catch(pageProblem);
	const [datasets, checks, certificates] = await Promise.all([
		listDatasets(database, actor, claim.id),
		listChecks(database, actor, claim.id),
		listCertificates(database, actor, claim.id)
	]).catch(pageProblem);
	const shown = datasets.find((d) => d.id === url.searchParams.get('dataset')) ?? datasets[0];
	const tables = shown ? await datasetTables(database, actor, shown.id).catch(pageProblem) : null;
	// Members see every analysis of the shown counts; editors and referees do not.
	const record = shown ? await countsRecord(database, actor, shown.id).catch(membersOnly) : null;
	// Each role sees only the forms and links it may use (the permission module decides).
	const may = await claimOffers(database, actor, {
		id: claim.id,
		groupId: claim.groupId,
		createdBy: claim.createdBy.id,
		state: claim.state,
		withdrawnReason: claim.withdrawal?.reason ?? null
	});
	return {
		claim,
		may,
		datasets,
		preview: shown && tables ? { dataset: shown, tables: tables.tables } : null,
		certificates,
		countsRecord: record,
		// The list needs only a line per check, not each full result.
		// Files no check has used yet may still be taken back.
		removable: !may['remove-dataset']
			? []
			: datasets.filter((d) => !checks.some((c) => c.datasetId === d.id)).map((d) => d.id),
		checks: checks.map((c) => ({
			id: c.id,
			datasetId: c.datasetId,
			status: c.status,
			createdAt: c.createdAt,
			seed: c.seed,
			resamples: c.resamples,
			certifiedSchmidtNumber: c.result?.certifiedSchmidtNumber ?? null,
			verdict: c.result?.claim?.verdict ?? null
		}))
	};
};

export const actions: Actions = {
	upload: async (event) => {
		const { request, locals, params, url } = event;
		const actor = requireSignedIn(locals, url);
		const { database } = await app();
		let datasetId: string | null = null;
		let values: Record<string, string> = {};
		try {
			// The slot is taken before the body is read: a refused upload costs no memory.
			datasetId = await withUploadSlot(database, actor, params.id, async () => {
				const form = await request.formData();
				const calibrationFile = form.get('calibration');
				// The files' names are the one value worth echoing: the page says which were refused.
				const names = form
					.getAll('counts')
					.flatMap((f) => (f instanceof File && f.name ? [f.name] : []));
				values = names.length ? { counts: names.join(', ') } : {};
				const files = await countsFilesOfForm(form);
				const calibration =
					calibrationFile instanceof File && calibrationFile.size > 0
						? new Uint8Array(await calibrationFile.arrayBuffer())
						: null;
				return (await addCountsFiles(database, actor, params.id, { files, calibration })).id;
			});
		} catch (problem) {
			return formRefusal(event, 'upload', problem, values);
		}
		redirect(303, `/claims/${params.id}?dataset=${datasetId}#preview`);
	},

	removeDataset: async ({ request, locals, params, url }) => {
		const actor = requireSignedIn(locals, url);
		const values = echoValues(await request.formData(), ['datasetId']);
		const { database } = await app();
		try {
			await removeDataset(database, actor, params.id, values.datasetId ?? '');
		} catch (problem) {
			return formFailure('removeDataset', problem, values);
		}
		redirect(303, `/claims/${params.id}`);
	},

	check: async ({ request, locals, params, url, setHeaders }) => {
		const actor = requireSignedIn(locals, url);
		const values = echoValues(await request.formData(), [
			'datasetId',
			'resamples',
			'confidence',
			'seed',
			'subtractAccidentals'
		]);
		const parsed = checkRequestSchema.safeParse(values);
		if (!parsed.success) return formFailure('check', parsed.error, values);
		const { database } = await app();
		let checkId: string;
		try {
			checkId = (await startCheck(database, actor, params.id, parsed.data)).id;
		} catch (problem) {
			return formRefusal({ setHeaders }, 'check', problem, values);
		}
		redirect(303, `/claims/${params.id}/checks/${checkId}`);
	},

	withdraw: async ({ request, locals, params, url }) => {
		const actor = requireSignedIn(locals, url);
		const values = echoValues(await request.formData(), ['reason', 'confirm']);
		const parsed = withdrawConfirmSchema.safeParse(values);
		if (!parsed.success) return formFailure('withdraw', parsed.error, values);
		const { database } = await app();
		try {
			await withdrawClaim(database, actor, params.id, parsed.data.reason);
		} catch (problem) {
			return formFailure('withdraw', problem, values);
		}
		redirect(303, `/claims/${params.id}`);
	}
};
