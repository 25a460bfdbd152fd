/**
 * Why company sign-in did not complete, as a code the callback puts in the sign-in page's URL. The
 * page shows only these fixed messages: a link carrying text of its own choosing (a phishing
 * message on our page) shows the general one instead.
 */
export const SSO_ERRORS = {
  email: "Enter your company e-mail address to use company sign-in.",
  refused: "Company sign-in was refused by the identity provider.",
  expired: "Company sign-in could not be completed: the sign-in request expired or did not match. Start again.",
  code: "Company sign-in failed: the identity provider did not accept the sign-in code.",
  token: "Company sign-in failed: the identity token did not pass its checks.",
  "no-account": "There is no Spanwright account for the e-mail address the identity provider gave. Ask your administrator for an invitation.",
} as const;

export type SsoErrorCode = keyof typeof SSO_ERRORS;

const GENERAL = "Company sign-in did not complete. Start again, or sign in with your password.";

/** The message for a code from the URL: one of ours, or the general one for anything else. */
export function ssoErrorMessage(code: string | null): string | null {
  if (code === null || code === "") return null;
  return Object.hasOwn(SSO_ERRORS, code) ? SSO_ERRORS[code as SsoErrorCode] : GENERAL;
}
