import { hasPermission } from "~/domain/permissions";
import type { CurrentUser } from "~/domain/people";
import { DomainError } from "~/domain/errors";
import { listCapturedMail, type CapturedMail } from "~/server/dev-services/mail";
import { env, mailCaptureEnabled } from "~/utils/env.server";

/** The mailbox exists only in local mode (the mail capture, on loopback). */
export function mailboxAvailable(): boolean {
  return mailCaptureEnabled();
}

/**
 * The local mailbox, as one signed-in person may read it: the mail addressed to them and, for an
 * administrator, every message about their organisation (invitations to people who have no account
 * yet included, so the administrator can pass the link on). Nobody else's mail, and nothing at all
 * unless the app runs in local mode with the mail capture.
 * @throws DomainError not-found outside local mode
 */
export async function mailboxFor(current: CurrentUser, opts: { to?: string; id?: string } = {}): Promise<{ messages: CapturedMail[]; selected: CapturedMail | null }> {
  if (!mailCaptureEnabled()) throw new DomainError("Page was not found.", { kind: "not-found" });
  const own = current.user.email.toLowerCase();
  const admin = hasPermission(current.roles, "org:admin");
  const visible = (await listCapturedMail(env().MAIL_CAPTURE_DIR!, { to: opts.to })).filter((m) => m.to.includes(own) || (admin && m.organisationId === current.organisation.id));
  const selectedId = opts.id ?? visible[0]?.id;
  return { messages: visible.slice(0, 200), selected: visible.find((m) => m.id === selectedId) ?? null };
}
