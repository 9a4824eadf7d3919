import { redirect } from '@sveltejs/kit';
import { checkRequestSchema } from '$lib/claims/schema';
import { claimOffers } from '$lib/server/access/permissions';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { listCertificates } from '$lib/server/certificates/certificate-reads';
import { startCheck, listChecks } from '$lib/server/checks/checks';
import { getClaim } from '$lib/server/claims/claims';
import { datasetTables, listDatasets } from '$lib/server/datasets/datasets';
import { addCountsFiles } from '$lib/server/datasets/counts-files';
import { runFormAction } from '$lib/server/http/form-action';
import { withUploadSlot } from '$lib/server/datasets/upload-slots';
import { removeDataset } from '$lib/server/datasets/dataset-removal';
import { countsRecord } from '$lib/server/datasets/counts-record';
import { withdrawClaim } from '$lib/server/claims/claim-withdraw';
import { ForbiddenError } from '$lib/server/core/errors';
import { uploadFrom } from './upload-form';
import { addTargetRun } from '$lib/server/claims/target-run';
import { targetRunOfForm } from '$lib/server/http/target-run-upload';
import { withdrawConfirmSchema } from './withdraw-schema';
import type { Actions, PageServerLoad } from './$types';

const membersOnly = (problem: unknown) => {
	if (problem instanceof ForbiddenError) return null;
	throw problem;
};

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
		const actor = requireSignedIn(event.locals, event.url);
		const { params } = event;
		// Filled in once the body is read: the page says which file was refused.
		const values: Record<string, string> = {};
		return runFormAction(event, 'upload', values, async () => {
			const { database } = await app();
			// The slot is taken before the body is read: a refused upload costs no memory.
			const datasetId = await withUploadSlot(database, actor, params.id, async () => {
				const upload = await uploadFrom(await event.request.formData(), values);
				return (await addCountsFiles(database, actor, params.id, upload)).id;
			});
			redirect(303, `/claims/${params.id}?dataset=${datasetId}#preview`);
		});
	},

	targetRun: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const { params } = event;
		return runFormAction(event, 'targetRun', {}, async () => {
			const { database } = await app();
			// The slot is taken before the body is read, as for counts.
			await withUploadSlot(database, actor, params.id, async () =>
				addTargetRun(
					database,
					actor,
					params.id,
					await targetRunOfForm(await event.request.formData())
				)
			);
			redirect(303, `/claims/${params.id}`);
		});
	},

	removeDataset: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const values = echoValues(await event.request.formData(), ['datasetId']);
		return runFormAction(event, 'removeDataset', values, async () => {
			const { database } = await app();
			await removeDataset(database, actor, event.params.id, values.datasetId ?? '');
			redirect(303, `/claims/${event.params.id}`);
		});
	},

	check: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const values = echoValues(await event.request.formData(), [
			'datasetId',
			'resamples',
			'confidence',
			'seed',
			'subtractAccidentals'
		]);
		return runFormAction(event, 'check', values, async () => {
			const input = checkRequestSchema.parse(values);
			const { database } = await app();
			const { id } = await startCheck(database, actor, event.params.id, input);
			redirect(303, `/claims/${event.params.id}/checks/${id}`);
		});
	},

	withdraw: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const values = echoValues(await event.request.formData(), ['reason', 'confirm']);
		return runFormAction(event, 'withdraw', values, async () => {
			const { reason } = withdrawConfirmSchema.parse(values);
			const { database } = await app();
			await withdrawClaim(database, actor, event.params.id, reason);
			redirect(303, `/claims/${event.params.id}`);
		});
	}
};
