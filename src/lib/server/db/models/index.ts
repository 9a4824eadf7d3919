/** All models of one database, with their associations in one place. */
import type { Sequelize } from 'sequelize';
import { defineApiToken } from './ApiToken';
import { defineAuditEvent } from './AuditEvent';
import { defineCertificate } from './Certificate';
import { defineCertificateDoi } from './CertificateDoi';
import { defineCheck } from './Check';
import { defineClaim } from './Claim';
import { defineDataset } from './Dataset';
import { defineEmailToken } from './EmailToken';
import { defineGroup } from './Group';
import { defineInvitation } from './Invitation';
import { defineLedgerEntry } from './LedgerEntry';
import { defineMailMessage } from './MailMessage';
import { defineMembership } from './Membership';
import { defineOutboxMail } from './OutboxMail';
import { defineReport } from './Report';
import { defineReviewLink } from './ReviewLink';
import { defineSession } from './Session';
import { defineShare } from './Share';
import { defineUser } from './User';

export function defineModels(sequelize: Sequelize) {
	const models = {
		User: defineUser(sequelize),
		Session: defineSession(sequelize),
		Group: defineGroup(sequelize),
		Membership: defineMembership(sequelize),
		Invitation: defineInvitation(sequelize),
		EmailToken: defineEmailToken(sequelize),
		Claim: defineClaim(sequelize),
		Dataset: defineDataset(sequelize),
		Check: defineCheck(sequelize),
		ApiToken: defineApiToken(sequelize),
		AuditEvent: defineAuditEvent(sequelize),
		MailMessage: defineMailMessage(sequelize),
		Certificate: defineCertificate(sequelize),
		LedgerEntry: defineLedgerEntry(sequelize),
		OutboxMail: defineOutboxMail(sequelize),
		Share: defineShare(sequelize),
		ReviewLink: defineReviewLink(sequelize),
		Report: defineReport(sequelize),
		CertificateDoi: defineCertificateDoi(sequelize)
	};
	const {
		User,
		Session,
		Group,
		Membership,
		Invitation,
		EmailToken,
		Claim,
		Dataset,
		Check,
		ApiToken
	} = models;
	User.hasMany(Session, { foreignKey: 'userId' });
	Session.belongsTo(User, { foreignKey: 'userId' });
	User.hasMany(Membership, { foreignKey: 'userId' });
	Membership.belongsTo(User, { foreignKey: 'userId' });
	Group.hasMany(Membership, { foreignKey: 'groupId' });
	Membership.belongsTo(Group, { foreignKey: 'groupId' });
	Group.hasMany(Invitation, { foreignKey: 'groupId' });
	Invitation.belongsTo(Group, { foreignKey: 'groupId' });
	User.hasMany(EmailToken, { foreignKey: 'userId' });
	Group.hasMany(Claim, { foreignKey: 'groupId' });
	Claim.belongsTo(Group, { foreignKey: 'groupId' });
	Claim.belongsTo(User, { foreignKey: 'createdBy', as: 'author' });
	Claim.hasMany(Dataset, { foreignKey: 'claimId' });
	Dataset.belongsTo(Claim, { foreignKey: 'claimId' });
	Claim.hasMany(Check, { foreignKey: 'claimId' });
	Check.belongsTo(Claim, { foreignKey: 'claimId' });
	Check.belongsTo(Dataset, { foreignKey: 'datasetId' });
	User.hasMany(ApiToken, { foreignKey: 'userId' });
	ApiToken.belongsTo(User, { foreignKey: 'userId' });
	return models;
}

export type Models = ReturnType<typeof defineModels>;
