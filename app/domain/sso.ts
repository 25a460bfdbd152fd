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

/**
 * How a signature through company sign-in ended, as a code the callback puts in the signing page's
 * URL; the page shows only these fixed messages.
 */
export const SIGNATURE_OUTCOMES = {
  signed: "Signed: company sign-in confirmed it was you.",
  expired: "The signature request expired, was already used, or belongs to another session: nothing was signed. Sign again.",
  mismatch: "Company sign-in vouched for someone else: nothing was signed.",
  "not-fresh": "The identity provider did not ask you to sign in again: nothing was signed. Every signature needs a fresh sign-in.",
  changed: "What you asked to sign has changed since: nothing was signed. Look at it again and sign anew.",
  forbidden: "Nothing was signed: nobody signs their own work, nor two roles on one report.",
  refused: "Nothing was signed: the step, case or report is no longer in a state to be signed.",
  failed: "Company sign-in did not complete: nothing was signed. Try again, or sign with your password.",
} as const;

export type SignatureOutcome = keyof typeof SIGNATURE_OUTCOMES;

/** The message for an outcome code from the URL, or null for anything that is not one. */
export function signatureOutcomeMessage(code: string | null): { ok: boolean; message: string } | null {
  if (!code || !Object.hasOwn(SIGNATURE_OUTCOMES, code)) return null;
  return { ok: code === "signed", message: SIGNATURE_OUTCOMES[code as SignatureOutcome] };
}
