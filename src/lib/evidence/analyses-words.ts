/** The words the PDF, /seal and the pages use for a certificate's standing among the analyses. */
import { isExploratory, type AnalysisEntry, type EvidenceAnalyses } from './analyses';

export const analysisLine = (a: AnalysisEntry, i: number): string =>
	`${i + 1}. ${a.method}, bases ${a.bases.join(' ')}, ${a.fourier}, confidence ${a.confidence}, ` +
	`${a.resamples} resamples, seed ${a.seed}${a.subtractAccidentals ? ', background-subtracted' : ''}`;

/** One sentence: declared and alone, or exploratory with the corrected level it is stated at. */
export function analysesSentence(
	a: Pick<EvidenceAnalyses, 'total' | 'declared' | 'nominalConfidence'>,
	stated: number
): string {
	if (!isExploratory(a))
		return `The claim's declared analysis, the only one run on these counts: stated at its confidence ${stated}.`;
	const which = a.declared ? "the claim's declared analysis" : 'not the declared analysis';
	return (
		`Exploratory: ${a.total} distinct analyses of these counts were run up to this certificate ` +
		`(this one ${which}); stated at confidence ${stated} = 1 − (1 − ${a.nominalConfidence})/${a.total} (Bonferroni); the check ran at ${a.nominalConfidence}.`
	);
}
