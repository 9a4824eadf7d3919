/** Certificates from time-ordered trials without the i.i.d. assumption (witnesses.md §10). */
export {
	BLOCKS_CONDITION,
	certifyTrials,
	isTrialsResult,
	TRACE_POINTS,
	TRIALS_LABEL,
	type TrialsOptions,
	type TrialsResult,
	type TrialsRung
} from './certify-trials';
export {
	betAgainst,
	betAgainstEach,
	BET_CAP,
	closedTestingRung,
	pValue,
	unitsNeeded
} from './martingale';
export { MAX_TRIALS, parseTrials, TrialsParser } from './parse';
export { checkSettings, SETTINGS_LEVEL, upperGamma, type SettingsCheck } from './settings-check';
export { isotropicTrialsCsv, mulberry32 } from './simulate-trials';
export { settingSequence, type TrialsData, type TrialsMode } from './store';
// recheck.ts and inflate.ts use node:zlib: imported directly, never through this index (pages import it).
