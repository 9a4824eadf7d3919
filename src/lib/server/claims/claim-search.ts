/**
 * The one text search over claims, for the claim list and the group archive: a case-blind
 * substring of the title, the source description or the manuscript reference, or the start of
 * the claim's id (at least 8 characters, so a short word does not match ids by chance).
 */
import { col, fn, Op, where as sqlWhere, type WhereOptions } from 'sequelize';

const TEXT_COLUMNS = ['title', 'source_description', 'manuscript_reference'];
const ID_PREFIX_MIN = 8;

/** The condition for search text `q` (already trimmed by the filter schema). */
export function claimTextWhere(q: string): WhereOptions {
	// instr() rather than LIKE, so that % and _ in the search are plain characters.
	const needle = q.toLowerCase();
	const at = (column: string) => fn('instr', fn('lower', col(column)), needle);
	const found = TEXT_COLUMNS.map((column) => sqlWhere(at(column), Op.gt, 0));
	if (needle.length >= ID_PREFIX_MIN) found.push(sqlWhere(at('id'), Op.eq, 1));
	return { [Op.or]: found };
}
