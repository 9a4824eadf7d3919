/**
 * What anyone may ask without signing in: a new account and a password reset. Both answer the
 * same whether or not the address has an account, and do the same work on either path (one
 * argon2 hash for a sign-up, one transaction with an audit row and one outbox mail for both),
 * so neither the words nor a stopwatch tell who has an account. The mail says which it was.
 */
import { checkedText } from '$lib/text-rules';
import { UniqueConstraintError, type Transaction } from 'sequelize';
import { hashPassword } from './auth';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { mailLink } from '../mail/mail';
import { takeOrRefuse } from '../core/rate-limits';
import { EMAIL_TAKEN, checkPassword, normaliseEmail } from './account-rules';
import { audit } from '../core/audit';
import { RESET_PASSWORD_TTL_MS, VERIFY_EMAIL_TTL_MS, issueEmailToken } from './email-tokens';
import { FieldError } from '../core/field-error';
import { newId } from '../core/ids';
import { invitedAddress } from './invitation-links';
import { queueMail } from '../mail/mail-queue';

/** A new confirmation link, and the mail carrying it, in the caller's transaction. */
export async function queueVerification(
	database: Database,
	user: { id: string; email: string; name: string },
	transaction: Transaction
) {
	const ttl = VERIFY_EMAIL_TTL_MS;
	const token = await issueEmailToken(database, user.id, 'verify-email', ttl, transaction);
	const values = { name: user.name, email: user.email, link: mailLink(`/verify/${token}`) };
	await queueMail(database, transaction, user.email, 'verify-email', values);
}

export interface SignUpOutcome {
	/** The new account, or the existing one the address already had (never shown to the caller). */
	userId: string;
	/** Came through a valid invitation to this address: confirmed already, sign in at once. */
	invited: boolean;
}

type Person = { email: string; name: string };

/**
 * Who asks, for the per-address limits: every web path names the client address; the demo and
 * scripts calling a service directly name none and are not counted.
 */
export interface Asker {
	address?: string;
}

/** The address already has an account: tell its owner, in the same shape of work as a sign-up. */
async function tellOwner(database: Database, userId: string, person: Person) {
	await writeTransaction(database, async (transaction) => {
		const details = { email: person.email };
		const entry = { actorId: null, subjectType: 'user', subjectId: userId, details };
		await audit(database, { ...entry, action: 'account.sign-up-existing' }, transaction);
		const owner = (await database.models.User.findByPk(userId, { transaction }))!;
		const values = { name: owner.get('name') as string, email: person.email };
		const link = mailLink('/reset');
		await queueMail(database, transaction, person.email, 'signup-existing', { ...values, link });
	});
	return { userId, invited: false };
}

/**
 * Makes an account and mails a confirmation link, or, for an address that has one, mails its
 * owner instead; the caller answers both alike. Through a valid invitation to this very address
 * (opening it proved the mailbox) the account is confirmed at once, and a taken address is said.
 * Sign-ups are rate-limited per client address (RATE_LIMITS.signUp).
 */
export async function signUp(
	database: Database,
	input: { email: string; name: string; password: string },
	proof: { invitationToken?: string | null } & Asker = {}
): Promise<SignUpOutcome> {
	if (proof.address !== undefined)
		await takeOrRefuse('signUp', proof.address, 'Too many sign-ups from your network address.');
	const { User } = database.models;
	const named = checkedText(input.name, 'Your name', 'line');
	const person = { email: normaliseEmail(input.email), name: named.text };
	if (!person.name) throw new FieldError('name', 'Enter your name.');
	if (named.problem) throw new FieldError('name', named.problem);
	checkPassword(input.password);
	// Hashed on both paths: an existing address must cost what a new one costs.
	const passwordHash = await hashPassword(input.password);
	const invited = await invitedAddress(database, proof.invitationToken, person.email);
	const existing = await User.findOne({ where: { email: person.email } });
	if (existing && invited) throw new FieldError('email', EMAIL_TAKEN);
	if (existing) return tellOwner(database, existing.get('id') as string, person);
	const userId = newId();
	try {
		await writeTransaction(database, async (transaction) => {
			const emailVerifiedAt = invited ? new Date() : null;
			const account = { id: userId, ...person, passwordHash, accountRole: 'researcher' as const };
			await User.create({ ...account, emailVerifiedAt }, { transaction });
			const entry = { actorId: userId, subjectType: 'user', subjectId: userId };
			const details = { email: person.email };
			await audit(database, { ...entry, action: 'account.signed-up', details }, transaction);
			if (!invited) return queueVerification(database, { id: userId, ...person }, transaction);
			const via = { via: 'invitation' };
			await audit(
				database,
				{ ...entry, action: 'account.email-verified', details: via },
				transaction
			);
		});
	} catch (error) {
		if (!(error instanceof UniqueConstraintError)) throw error;
		// Someone took the address a moment ago: their owner hears of it, as above.
		const taken = (await User.findOne({ where: { email: person.email } }))!;
		if (invited) throw new FieldError('email', EMAIL_TAKEN);
		return tellOwner(database, taken.get('id') as string, person);
	}
	return { userId, invited };
}

/**
 * Mails a reset link when the address has an account, and otherwise a note that it has none;
 * says nothing either way to the caller. One transaction, one audit row, one mail on both paths.
 * Rate-limited per client address (RATE_LIMITS.resetRequest).
 */
export async function requestPasswordReset(
	database: Database,
	input: string,
	asker: Asker = {}
): Promise<void> {
	const what = 'Too many new-password requests from your network address.';
	if (asker.address !== undefined) await takeOrRefuse('resetRequest', asker.address, what);
	const email = normaliseEmail(input);
	const user = (await database.models.User.findOne({ where: { email } }))?.get({ plain: true });
	await writeTransaction(database, async (transaction) => {
		const entry = { actorId: null, subjectType: 'user', subjectId: user?.id ?? null };
		if (user) {
			const ttl = RESET_PASSWORD_TTL_MS;
			const token = await issueEmailToken(database, user.id, 'reset-password', ttl, transaction);
			await audit(database, { ...entry, action: 'account.password-reset-requested' }, transaction);
			const link = mailLink(`/reset/${token}`);
			const values = { name: user.name, email: user.email, link };
			await queueMail(database, transaction, user.email, 'reset-password', values);
		} else {
			const details = { email };
			await audit(database, { ...entry, action: 'account.reset-no-account', details }, transaction);
			const values = { email, link: mailLink('/signup') };
			await queueMail(database, transaction, email, 'reset-no-account', values);
		}
	});
}
