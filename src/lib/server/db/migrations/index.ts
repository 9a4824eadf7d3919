/** Numbered migrations in order; listed by hand so that bundling keeps them. */
import * as initial from './0001-initial';
import * as fourierConvention from './0002-fourier-convention';
import * as tokenExpiry from './0003-token-expiry';
import * as datasetSummary from './0004-dataset-summary';
import * as certificates from './0005-certificates';
import * as sharingReview from './0006-sharing-review';
import * as outboxArchive from './0007-outbox-archive';
import * as checkFairUse from './0008-check-fair-use';
import * as mailCap from './0009-mail-cap';
import * as checkAttempts from './0010-check-attempts';
import * as analyses from './0011-analyses';
import * as ledgerKeyEntries from './0012-ledger-key-entries';
import * as noLiveSecrets from './0014-no-live-secrets';
import * as shareOpened from './0015-share-opened';
import * as datasetCalibration from './0016-dataset-calibration';
import * as trialsClaims from './0018-trials-claims';
import * as targetClaims from './0020-target-claims';
import * as certificateDois from './0021-certificate-dois';
import * as orcidIds from './0022-orcid-ids';
import * as countsAdvice from './0024-counts-advice';
import * as targetRuns from './0025-target-runs';

export const migrations = [
	{ name: '0001-initial', ...initial },
	{ name: '0002-fourier-convention', ...fourierConvention },
	{ name: '0003-token-expiry', ...tokenExpiry },
	{ name: '0004-dataset-summary', ...datasetSummary },
	{ name: '0005-certificates', ...certificates },
	{ name: '0006-sharing-review', ...sharingReview },
	{ name: '0007-outbox-archive', ...outboxArchive },
	{ name: '0008-check-fair-use', ...checkFairUse },
	{ name: '0009-mail-cap', ...mailCap },
	{ name: '0010-check-attempts', ...checkAttempts },
	{ name: '0011-analyses', ...analyses },
	{ name: '0012-ledger-key-entries', ...ledgerKeyEntries },
	{ name: '0014-no-live-secrets', ...noLiveSecrets },
	{ name: '0015-share-opened', ...shareOpened },
	{ name: '0016-dataset-calibration', ...datasetCalibration },
	{ name: '0018-trials-claims', ...trialsClaims },
	{ name: '0020-target-claims', ...targetClaims },
	{ name: '0021-certificate-dois', ...certificateDois },
	{ name: '0022-orcid-ids', ...orcidIds },
	{ name: '0024-counts-advice', ...countsAdvice },
	{ name: '0025-target-runs', ...targetRuns }
];
