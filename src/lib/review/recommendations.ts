/** A referee's recommendations: the values the API takes and the words the report form shows. */
export const RECOMMENDATIONS = ['sound', 'needs-revision', 'unsound'] as const;
export type Recommendation = (typeof RECOMMENDATIONS)[number];

export const RECOMMENDATION_LABELS: Record<Recommendation, string> = {
	sound: 'Sound',
	'needs-revision': 'Needs revision',
	unsound: 'Unsound'
};

/** The form's words for the choice; the API's names its values. */
export const RECOMMENDATION_MISSING = {
	form: `Choose a recommendation: ${RECOMMENDATIONS.map((r) => RECOMMENDATION_LABELS[r])
		.join(', ')
		.replace(/, (?=[^,]*$)/, ' or ')}.`,
	json: `Give recommendation as one of ${RECOMMENDATIONS.join(', ')}.`
};
