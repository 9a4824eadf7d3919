/** Account limits, exported once for the account service, the zod schemas and the forms. */
export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_LENGTH = 256;
export const NAME_MAX_LENGTH = 120;
