/** What the editor and the referee see: shares, review links, reports. */
import type { Recommendation } from '$lib/review/recommendations';
import type { CertificateView } from './certificates';

export type ReportState = 'draft' | 'submitted' | 'released';

export interface ReportView {
	id: string;
	claimId: string;
	recommendation: Recommendation;
	comments: string;
	state: ReportState;
	submittedAt: string | null;
	releasedAt: string | null;
}

export interface ShareView {
	id: string;
	claimId: string;
	editorEmail: string;
	journal: string;
	manuscript: string;
	/** Whether the editor has opened the notice's link (not merely has an account). */
	opened: boolean;
	createdAt: string;
	withdrawnAt: string | null;
}

export type ReviewLinkState = 'active' | 'expired' | 'revoked';

export interface ReviewLinkView {
	id: string;
	claimId: string;
	label: string | null;
	state: ReviewLinkState;
	expiresAt: string;
	createdAt: string;
}

export interface SharedClaim {
	share: ShareView;
	claim: {
		id: string;
		title: string;
		dimension: number;
		method: string;
		claimedSchmidtNumber: number;
		state: string;
	};
	certificates: CertificateView[];
	links: (ReviewLinkView & { report: ReportView | null })[];
}
