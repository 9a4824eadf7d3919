import { json } from '@sveltejs/kit';
import { apiEndpoint } from '$lib/server/http/api';
import { readTargetRunUpload } from '$lib/server/http/target-run-upload';
import { addTargetRun } from '$lib/server/claims/target-run';
import { withUploadSlot } from '$lib/server/datasets/upload-slots';

/** A fidelity-target claim's calibration run: λ fitted on it and frozen; answers the claim. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const claimId = event.params.id!;
	// The slot is taken before the body is read: a refused upload costs no memory.
	const claim = await withUploadSlot(database, actor, claimId, async () =>
		addTargetRun(database, actor, claimId, await readTargetRunUpload(event.request, event.url))
	);
	return json(claim, { status: 201 });
});
