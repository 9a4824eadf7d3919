/**
 * The ladder of bounds as vector graphics: one row per rung r with the region a state of Schmidt
 * number at most r can reach, the statistic with its 95 % interval, a numeric axis and the
 * one-sided lower bound marked across every rung.
 */
import type { BoundRung, CertificationResult } from '../../certify';
import { ticks } from './pdf-axis';

type Doc = PDFKit.PDFDocument;

const INK = '#1d2430';
const REACH = '#d9dee6';
const MARK = '#0b6e4f';
const SHORT = '#a33a1f';
const LABEL_WIDTH = 48;
const ROW_HEIGHT = 15;
/** Past this many rungs the chart and table keep the ones a reader needs (see shownRungs). */
export const MOST_RUNGS = 12;

export const num = (v: number, digits = 4) =>
	Number.isFinite(v) ? Number(v.toPrecision(digits)).toString() : 'n/a';

/** All rungs when few; else the first two, those around the certified and claimed numbers, the last. */
export function shownRungs(result: CertificationResult): BoundRung[] {
	const { bounds } = result;
	if (bounds.length <= MOST_RUNGS) return bounds;
	const near = [result.certifiedSchmidtNumber, result.claim?.schmidtNumber ?? 0];
	const keep = (r: number, i: number) =>
		i < 2 || i === bounds.length - 1 || near.some((n) => Math.abs(r - n) <= 2);
	return bounds.filter((b, i) => keep(b.upToSchmidtNumber, i));
}

function scaleFor(result: CertificationResult, rungs: BoundRung[], x: number, width: number) {
	const { statistic } = result;
	const values = [0, statistic.interval95[0], statistic.interval95[1], statistic.lower];
	values.push(...rungs.map((b) => b.bound), statistic.value);
	const finite = values.filter(Number.isFinite);
	const lo = Math.min(...finite);
	const hi = Math.max(...finite);
	const pad = (hi - lo) * 0.05 || 1;
	const at = (v: number) => x + ((v - (lo - pad)) / (hi - lo + 2 * pad)) * width;
	return { at, lo, hi };
}

type Scale = ReturnType<typeof scaleFor>;

/** One rung: the reachable region up to its bound, and the statistic drawn against it. */
function drawRung(
	doc: Doc,
	result: CertificationResult,
	rung: BoundRung,
	at: Scale['at'],
	x: number,
	top: number
) {
	const { statistic } = result;
	const plotX = x + LABEL_WIDTH;
	doc.font('serif').fillColor(INK).fontSize(8);
	doc.text(`r = ${rung.upToSchmidtNumber}`, x, top + 3, {
		width: LABEL_WIDTH - 6,
		lineBreak: false
	});
	doc.rect(plotX, top + 3, Math.max(0, at(rung.bound) - plotX), ROW_HEIGHT - 6).fill(REACH);
	doc.moveTo(at(rung.bound), top + 1).lineTo(at(rung.bound), top + ROW_HEIGHT - 1);
	doc.lineWidth(1).stroke(INK);
	const mid = top + ROW_HEIGHT / 2;
	doc.moveTo(at(statistic.interval95[0]), mid).lineTo(at(statistic.interval95[1]), mid);
	doc.lineWidth(1.2).stroke(MARK);
	doc.circle(at(statistic.value), mid, 2.4).fill(MARK);
	doc.moveTo(at(statistic.lower), mid - 4).lineTo(at(statistic.lower), mid + 4);
	doc.lineWidth(1.5).stroke(statistic.lower > rung.bound ? MARK : SHORT);
}

/** The numeric axis: round ticks with their values, and the lower bound marked and labelled. */
function drawAxis(
	doc: Doc,
	scale: Scale,
	lower: number,
	plotX: number,
	plotWidth: number,
	top: number,
	axisY: number
) {
	const { at, lo, hi } = scale;
	doc
		.moveTo(plotX, axisY)
		.lineTo(plotX + plotWidth, axisY)
		.lineWidth(0.5)
		.stroke(INK);
	doc.font('serif').fontSize(7).fillColor(INK);
	for (const v of ticks(lo, hi)) {
		doc
			.moveTo(at(v), axisY)
			.lineTo(at(v), axisY + 3)
			.lineWidth(0.5)
			.stroke(INK);
		doc.text(String(v), at(v) - 25, axisY + 4, { width: 50, align: 'center', lineBreak: false });
	}
	doc.save().dash(2, { space: 2 });
	doc
		.moveTo(at(lower), top)
		.lineTo(at(lower), axisY + 14)
		.lineWidth(0.8)
		.stroke(MARK);
	doc.restore();
	doc.fillColor(MARK).fontSize(7.5);
	const labelX = Math.min(at(lower) - 60, plotX + plotWidth + 30 - 120);
	doc.text(`lower bound ${num(lower, 5)}`, labelX, axisY + 15, {
		width: 120,
		align: labelX < at(lower) - 60 ? 'right' : 'center',
		lineBreak: false
	});
}

const LEGEND =
	'Grey: values reachable with Schmidt number at most r (the bar ends at the bound of rung r). Green dot: the statistic; line: its 95 % interval; tick and dashed line: the one-sided lower bound (green on a rung it exceeds).';

/** Draws the ladder at (x, y) and returns the height used. */
export function drawLadder(
	doc: Doc,
	result: CertificationResult,
	x: number,
	y: number,
	width: number
) {
	const rungs = shownRungs(result);
	const plotX = x + LABEL_WIDTH;
	const plotWidth = width - LABEL_WIDTH - 30;
	const scale = scaleFor(result, rungs, plotX, plotWidth);
	rungs.forEach((rung, i) => drawRung(doc, result, rung, scale.at, x, y + i * ROW_HEIGHT));
	const axisY = y + rungs.length * ROW_HEIGHT + 4;
	drawAxis(doc, scale, result.statistic.lower, plotX, plotWidth, y, axisY);
	doc.font('serif').fillColor(INK).fontSize(7.5);
	const elided =
		rungs.length < result.bounds.length
			? ` Rungs shown: ${rungs.length} of ${result.bounds.length}.`
			: '';
	doc.text(LEGEND + elided, x, axisY + 28, { width });
	return doc.y - y;
}
