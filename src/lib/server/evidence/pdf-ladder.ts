/**
 * The ladder of bounds as vector graphics: one row per rung k with the region a state of Schmidt
 * number at most k can reach, and the statistic with its 95 % interval and lower bound drawn
 * against it.
 */
import type { CertificationResult } from '../../certify';

type Doc = PDFKit.PDFDocument;

const INK = '#1d2430';
const REACH = '#d9dee6';
const MARK = '#0b6e4f';

function scaleFor(result: CertificationResult, x: number, width: number) {
	const { statistic, bounds } = result;
	const values = [0, statistic.interval95[0], statistic.interval95[1], statistic.lower];
	values.push(...bounds.map((b) => b.bound), statistic.value);
	const lo = Math.min(...values);
	const hi = Math.max(...values);
	const pad = (hi - lo) * 0.05 || 1;
	const at = (v: number) => x + ((v - (lo - pad)) / (hi - lo + 2 * pad)) * width;
	return { at, lo, hi };
}

const LABEL_WIDTH = 70;
const ROW_HEIGHT = 16;

type Scale = ReturnType<typeof scaleFor>;

/** One rung: the reachable region up to its bound, and the statistic drawn against it. */
function drawRung(
	doc: Doc,
	result: CertificationResult,
	i: number,
	at: Scale['at'],
	x: number,
	top: number
) {
	const rung = result.bounds[i];
	const { statistic } = result;
	const plotX = x + LABEL_WIDTH;
	doc.fillColor(INK).fontSize(8);
	doc.text(`k = ${rung.upToSchmidtNumber}`, x, top + 3, {
		width: LABEL_WIDTH - 6,
		lineBreak: false
	});
	doc.rect(plotX, top + 3, at(rung.bound) - plotX, ROW_HEIGHT - 6).fill(REACH);
	doc.moveTo(at(rung.bound), top + 1).lineTo(at(rung.bound), top + ROW_HEIGHT - 1);
	doc.lineWidth(1).stroke(INK);
	const mid = top + ROW_HEIGHT / 2;
	doc.moveTo(at(statistic.interval95[0]), mid).lineTo(at(statistic.interval95[1]), mid);
	doc.lineWidth(1.2).stroke(MARK);
	doc.circle(at(statistic.value), mid, 2.4).fill(MARK);
	doc.moveTo(at(statistic.lower), mid - 4).lineTo(at(statistic.lower), mid + 4);
	doc.lineWidth(1.5).stroke(statistic.lower > rung.bound ? MARK : '#a33a1f');
}

/** The value axis under the rungs with its two end labels. */
function drawAxis(
	doc: Doc,
	{ at, lo, hi }: Scale,
	plotX: number,
	plotWidth: number,
	axisY: number
) {
	doc
		.moveTo(plotX, axisY)
		.lineTo(plotX + plotWidth, axisY)
		.lineWidth(0.5)
		.stroke(INK);
	for (const v of [lo, hi]) {
		doc
			.moveTo(at(v), axisY)
			.lineTo(at(v), axisY + 3)
			.stroke(INK);
		const label = String(Number(v.toPrecision(4)));
		doc.fillColor(INK).fontSize(7);
		doc.text(label, at(v) - 30, axisY + 4, { width: 60, align: 'center', lineBreak: false });
	}
}

const LEGEND =
	'Grey: values reachable with Schmidt number at most k (bar ends at the bound). Green dot: the statistic; line: its 95 % interval; tick: the one-sided lower bound (green when it exceeds the rung).';

/** Draws the ladder at (x, y) and returns the height used. */
export function drawLadder(
	doc: Doc,
	result: CertificationResult,
	x: number,
	y: number,
	width: number
) {
	const plotX = x + LABEL_WIDTH;
	const plotWidth = width - LABEL_WIDTH;
	const scale = scaleFor(result, plotX, plotWidth);
	result.bounds.forEach((_, i) => drawRung(doc, result, i, scale.at, x, y + i * ROW_HEIGHT));
	const axisY = y + result.bounds.length * ROW_HEIGHT + 4;
	drawAxis(doc, scale, plotX, plotWidth, axisY);
	doc
		.fillColor(INK)
		.fontSize(7.5)
		.text(LEGEND, x, axisY + 14, { width });
	return doc.y - y;
}
