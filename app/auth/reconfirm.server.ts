import { eq } from "drizzle-orm";
import { writeAudit } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { DomainError } from "~/domain/errors";
import type { CurrentUser } from "~/domain/people";
import type { CredentialPurpose } from "~/domain/vocabulary";
import { dummyPasswordHash, verifyPassword } from "~/utils/password.server";
import { checkThrottle, recordAttempt } from "./throttle.server";

/**
 * A signed-in person proves again, with their password, that it is them: before a signature, and
 * before their password changes. Wrong passwords are throttled per person with the same growing
 * delays as sign-in, and each one is written to the organisation's audit trail (who, for what,
 * from where), so guessing at an unattended session can neither go on unchecked nor unseen.
 * @throws DomainError unauthenticated for a missing or wrong password; too-many while held back
 */
export async function reconfirmPassword(input: {
  current: CurrentUser;
  password: string | undefined;
  purpose: Extract<CredentialPurpose, "signature" | "password-change">;
  /** What the proof is for, for the audit trail: the record and what was to be done to it. */
  about: { entityType: string; entityId: string; what: string };
  address: string;
  /** The form field that holds the password, for the refusal's message. */
  field?: string;
}): Promise<void> {
  const { current } = input;
  const field = input.field ?? "password";
  const missing = input.purpose === "signature" ? "Confirm your identity to sign: enter your password." : "Enter your current password.";
  if (!input.password) throw new DomainError(missing, { field, kind: "unauthenticated" });
  const email = current.user.email.toLowerCase();
  const throttle = await checkThrottle({ purpose: input.purpose, email, device: false });
  if (!throttle.ok) throw new DomainError(throttle.message, { field, kind: "too-many" });
  const [user] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, current.user.id));
  const valid = user?.passwordHash ? await verifyPassword(user.passwordHash, input.password) : (await verifyPassword(await dummyPasswordHash(), input.password), false);
  await recordAttempt({ purpose: input.purpose, email, address: input.address, device: false, succeeded: valid });
  if (valid) return;
  await db.transaction((tx) =>
    writeAudit(tx, {
      organisationId: current.organisation.id,
      actor: current.user,
      action: `auth.${input.purpose}.password-refused`,
      entityType: input.about.entityType,
      entityId: input.about.entityId,
      after: { what: input.about.what, address: input.address },
    }),
  );
  const wrong = input.purpose === "signature" ? "The password is not correct: the signature was not recorded." : "The current password is not correct.";
  throw new DomainError(user?.passwordHash ? wrong : `${wrong} Your account has no password: use company sign-in.`, { field, kind: "unauthenticated" });
}
