import { eq } from "drizzle-orm";
import { writeAudit } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { DomainError } from "~/domain/errors";
import { acceptInvitation, findInvitation } from "~/services/organisation.server";
import { checkThrottle, recordAttempt } from "./throttle.server";

/**
 * Joins an organisation by invitation. When the invited address already has an account, the
 * invitation is accepted only with that account's password; whoever holds the link could guess
 * it, so the check is throttled like a sign-in (per account and per client address, growing
 * delays) and every wrong password is written to the inviting organisation's audit trail.
 * @throws DomainError not-found for a spent link, unauthenticated for a wrong password, too-many while held back
 */
export async function joinByInvitation(input: { token: string; name?: string; password: string; address: string }) {
  const found = await findInvitation(input.token);
  if (!found?.accountExists) return acceptInvitation(input);
  const email = found.invitation.email;
  const throttle = await checkThrottle({ purpose: "invitation", email, address: input.address, device: false });
  if (!throttle.ok) throw new DomainError(throttle.message, { field: "password", kind: "too-many" });
  try {
    const joined = await acceptInvitation(input);
    await recordAttempt({ purpose: "invitation", email, address: input.address, device: false, succeeded: true });
    return joined;
  } catch (error) {
    if (error instanceof DomainError && error.kind === "unauthenticated") {
      await recordAttempt({ purpose: "invitation", email, address: input.address, device: false, succeeded: false });
      const [account] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
      await db.transaction((tx) =>
        writeAudit(tx, {
          organisationId: found.invitation.organisationId,
          actor: account ? { id: account.id, email } : null,
          action: "auth.invitation.password-refused",
          entityType: "invitation",
          entityId: found.invitation.id,
          after: { address: input.address },
        }),
      );
    }
    throw error;
  }
}
