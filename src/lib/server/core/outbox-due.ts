/** What an outbox (mail, DOIs) sends next: queued rows, or retrying ones whose time has come. */
import { Op } from 'sequelize';

/** The rows due at `now`, oldest first, at most 100 a pass. */
export const dueRowsQuery = (now: Date) => ({
	where: { status: { [Op.in]: ['queued', 'retrying'] }, nextAttemptAt: { [Op.lte]: now } },
	order: [['createdAt', 'ASC']] as [string, string][],
	limit: 100
});
