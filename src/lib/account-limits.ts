/** Account limits, exported once for the account service, the zod schemas and the forms. */
export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_LENGTH = 256;
export const NAME_MAX_LENGTH = 120;
/** The longest address SMTP carries (RFC 5321's 256-octet path, less its angle brackets). */
export const EMAIL_MAX_LENGTH = 254;
