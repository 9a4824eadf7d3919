/** JSON bodies of the API that no service owns: kept here so the routes and the OpenAPI document share them. */
import { z } from 'zod';
import { withdrawReasonField } from './withdrawal';

/** POST /api/v1/claims/{id}/certificates: the finished check to certify. */
export const issueJsonSchema = z.object({
	checkId: z.string().trim().min(1, 'Name the finished check.')
});

/** POST /api/v1/claims/{id}/withdraw and /certificates/{id}/withdraw: why (recorded on the ledger). */
export const withdrawJsonSchema = z.object({ reason: withdrawReasonField });
