/** Calibrated bases (witnesses.md §4.4): the file, the ladder from measured overlaps, the tolerance. */
export {
	MAX_CALIBRATED_SIZE,
	MAX_CALIBRATION_BYTES,
	MAX_CALIBRATION_TOLERANCE,
	parseCalibration,
	type Calibration,
	type CalibratedBasis
} from './calibration-file';
export { calibratedBounds, calibratedMu, gramMatrix, type CalibratedMu } from './calibrated-ladder';
export { calibrationTolerance, percent, type CalibrationTolerance } from './calibration-tolerance';
export { largestEigenvalueUpper } from './largest-eigenvalue';
export { calibratedPairLimit, checkOrthonormal, largestBias, overlapMatrix } from './overlaps';
export { calibrationSummary, type CalibrationSummary } from './summary';
