import { error, fail, redirect } from '@sveltejs/kit';
import { InputError, MAX_COUNTS_FILE_BYTES } from '$lib/certify';
import { checkRequestSchema } from '$lib/claims/schema';
import { app } from '$lib/server/app';
import { echoValues, fieldErrors, requireUser } from '$lib/server/auth-web';
import { startCheck, listChecks } from '$lib/server/services/checks';
import { getClaim } from '$lib/server/services/claims';
import { addDataset, datasetTables, listDatasets } from '$lib/server/services/datasets';
import { removeDataset } from '$lib/server/services/dataset-removal';
import { ConflictError, NotFoundError } from '$lib/server/services/errors';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireUser(locals, url);
	const { database } = await app();
	const claim = await getClaim(database, user.id, params.id);
	if (!claim) error(404, 'No such claim.');
	const [datasets, checks] = await Promise.all([
		listDatasets(database, user.id, claim.id),
		listChecks(database, user.id, claim.id)
	]);
	const shown = datasets.find((d) => d.id === url.searchParams.get('dataset')) ?? datasets[0];
	const tables = shown ? await datasetTables(database, user.id, shown.id) : null;
	return {
		claim,
		datasets,
		preview: shown && tables ? { dataset: shown, tables: tables.tables } : null,
		// The list needs only a line per check, not each full result.
		// Files no check has used yet may still be taken back.
		removable: datasets.filter((d) => !checks.some((c) => c.datasetId === d.id)).map((d) => d.id),
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

const uploadFailure = (
	message: string,
	fileName: string | null,
	line?: number,
	column?: number,
	status = 400
) =>
	fail(status, {
		uploadError: {
			// The line is shown on its own, so the message need not repeat it.
			message: message.replace(/^line \d+(, column \d+)?: /, ''),
			line: line ?? null,
			column: column ?? null,
			fileName
		}
	});

export const actions: Actions = {
	upload: async ({ request, locals, params, url }) => {
		const user = requireUser(locals, url);
		const file = (await request.formData()).get('counts');
		if (!(file instanceof File) || file.size === 0) {
			return uploadFailure('Choose a counts file (CSV or JSON) to upload.', null);
		}
		if (file.size > MAX_COUNTS_FILE_BYTES) {
			return uploadFailure(`The file is ${file.size} bytes; the limit is 20 MiB.`, file.name);
		}
		const { database } = await app();
		let datasetId: string;
		try {
			const bytes = new Uint8Array(await file.arrayBuffer());
			datasetId = (
				await addDataset(database, user.id, params.id, { bytes, originalName: file.name })
			).id;
		} catch (problem) {
			if (problem instanceof InputError) {
				return uploadFailure(problem.message, file.name, problem.line, problem.column);
			}
			if (problem instanceof ConflictError)
				return uploadFailure(problem.message, file.name, undefined, undefined, 409);
			if (problem instanceof NotFoundError) error(404, 'No such claim.');
			throw problem;
		}
		redirect(303, `/claims/${params.id}?dataset=${datasetId}#preview`);
	},

	removeDataset: async ({ request, locals, params, url }) => {
		const user = requireUser(locals, url);
		const datasetId = String((await request.formData()).get('datasetId') ?? '');
		const { database } = await app();
		try {
			await removeDataset(database, user.id, params.id, datasetId);
		} catch (problem) {
			if (problem instanceof ConflictError)
				return fail(409, { removeError: { datasetId, message: problem.message } });
			if (problem instanceof NotFoundError) error(404, problem.message);
			throw problem;
		}
		redirect(303, `/claims/${params.id}`);
	},

	check: async ({ request, locals, params, url }) => {
		const user = requireUser(locals, url);
		const values = echoValues(await request.formData(), [
			'datasetId',
			'resamples',
			'confidence',
			'seed',
			'subtractAccidentals'
		]);
		const parsed = checkRequestSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { checkErrors: fieldErrors(parsed.error), checkValues: values });
		}
		const { database } = await app();
		let checkId: string;
		try {
			checkId = (await startCheck(database, user.id, params.id, parsed.data)).id;
		} catch (problem) {
			if (problem instanceof InputError) {
				return fail(400, { checkErrors: { '': problem.message }, checkValues: values });
			}
			if (problem instanceof NotFoundError) error(404, problem.message);
			throw problem;
		}
		redirect(303, `/claims/${params.id}/checks/${checkId}`);
	}
};
