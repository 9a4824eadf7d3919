/**
 * A fidelity-target claim's declared λ at the boundary (zod): d positive coefficients, not
 * increasing, Σλ² = 1 within 1e-6 or scaled by us (the scaled claim keeps λ as declared), and
 * every error names the field `target`. witnesses.md §4.3′ defines Φ_λ = Σ_m λ_m |mm⟩, Σλ² = 1.
 */
import { describe, expect, it } from 'vitest';
import { claimInputSchema, claimJsonSchema } from '../../src/lib/claims/schema';

const base = {
	title: 'Pixel pairs, declared target',
	sourceDescription: 'Simulated',
	dimension: 3,
	method: 'fidelity-target',
	claimedSchmidtNumber: 2
};
const unit = [0.863, 0.485, 0.143].map((x) => x / Math.hypot(0.863, 0.485, 0.143));

function targetIssues(values: Record<string, unknown>): string[] {
	const parsed = claimJsonSchema.safeParse(values);
	expect(parsed.success).toBe(false);
	return parsed.error!.issues.filter((i) => i.path[0] === 'target').map((i) => i.message);
}

describe('claim target λ (fidelity-target)', () => {
	it('keeps a normalised λ as declared, bases 0,1, nothing scaled', () => {
		const claim = claimJsonSchema.parse({ ...base, target: unit });
		expect(claim.method).toBe('fidelity-target');
		expect(claim.target).toEqual(unit);
		expect(claim.targetDeclared).toBeNull();
		expect(claim.bases).toEqual([0, 1]);
	});

	it('scales λ of any other scale to Σλ² = 1 and keeps the declared values beside it', () => {
		const claim = claimInputSchema.parse({ ...base, target: '0.863, 0.485, 0.143' });
		// Σλ² = 1 after scaling: the definition of Φ_λ's coefficients (witnesses.md §4.3′).
		expect(claim.target!.reduce((s, x) => s + x * x, 0)).toBeCloseTo(1, 12);
		claim.target!.forEach((x, i) => expect(x).toBeCloseTo(unit[i], 12));
		expect(claim.targetDeclared).toEqual([0.863, 0.485, 0.143]);
		// The uniform target is the maximally entangled state (λ = 1/√d): allowed, not increasing.
		expect(claimJsonSchema.parse({ ...base, target: [1, 1, 1] }).target).toEqual(
			Array(3).fill(1 / Math.sqrt(3))
		);
	});

	it('names the field target for a missing, short, increasing, zero or non-numeric λ', () => {
		expect(targetIssues(base)).toEqual([expect.stringMatching(/Declare the target/)]);
		expect(targetIssues({ ...base, target: [0.8, 0.6] })).toEqual([
			expect.stringMatching(/Give 3 Schmidt coefficients/)
		]);
		expect(targetIssues({ ...base, target: [0.5, 0.7, 0.5] })).toEqual([
			expect.stringMatching(/must not increase \(0.5 then 0.7\)/)
		]);
		expect(targetIssues({ ...base, target: [0.9, 0.4, 0] })).toEqual([
			expect.stringMatching(/above 0/)
		]);
		expect(targetIssues({ ...base, target: 'a, b, c' })).toHaveLength(3);
	});

	it('refuses a target on any other method, and other bases than 0,1', () => {
		expect(targetIssues({ ...base, method: 'fidelity-two-basis', target: unit })).toEqual([
			'Only the fidelity-target method takes a target.'
		]);
		const parsed = claimJsonSchema.safeParse({ ...base, target: unit, bases: [0, 2] });
		expect(parsed.error?.issues.map((i) => i.path.join('.'))).toEqual(['bases']);
	});
});

describe('claim target λ, parsed twice (the API path validates, then the service again)', () => {
	it('parses a validated claim unchanged, scaled or not, and one without a target', () => {
		const scaled = claimJsonSchema.parse({ ...base, target: [0.863, 0.485, 0.143] });
		expect(claimInputSchema.parse(scaled)).toEqual(scaled);
		const plain = claimJsonSchema.parse({ ...base, method: 'mub-correlation' });
		expect(plain).toMatchObject({ target: null, targetDeclared: null });
		expect(claimInputSchema.parse(plain)).toEqual(plain);
		// A "declared" λ that does not scale to the target is not kept.
		const forged = claimJsonSchema.parse({ ...base, target: unit, targetDeclared: [3, 2, 1] });
		expect(forged.targetDeclared).toBeNull();
	});
});

describe('OpenAPI document names the claim target', () => {
	it('takes target on ClaimInput, shows it on Claim, and lists fidelity-target as a claim method', async () => {
		const { schemas } = await import('../../src/routes/api/v1/openapi.json/schemas');
		const { requestSchemas } = await import('../../src/routes/api/v1/openapi.json/request-bodies');
		const input = requestSchemas.ClaimInput.properties as Record<string, { enum?: readonly string[] }>;
		expect(input.target).toBeDefined();
		expect(input.method.enum).toContain('fidelity-target');
		expect((schemas.Claim.properties as Record<string, unknown>).target).toBeDefined();
	});
});

describe('the planner and fidelity-target', () => {
	it('refuses fidelity-target with a message saying why, naming the field method', async () => {
		const { planQuery, PLANNER_TARGET_REFUSAL } =
			await import('../../src/lib/certify/planner/query');
		const query = { dimension: 3, schmidtNumber: 2, visibility: 0.9 };
		const refused = planQuery.safeParse({ ...query, method: 'fidelity-target' });
		expect(refused.error?.issues).toEqual([
			expect.objectContaining({ path: ['method'], message: PLANNER_TARGET_REFUSAL })
		]);
		expect(planQuery.safeParse({ ...query, method: 'fidelity-two-basis' }).success).toBe(true);
	});
});
