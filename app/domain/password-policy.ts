/** Password length rules, shared by the browser-side form check and the server. */
export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 256;
