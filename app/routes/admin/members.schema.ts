import { z } from "zod";
import { ROLES } from "~/domain/vocabulary";

const roles = z.array(z.enum(ROLES, "Unknown role")).min(1, "Choose at least one role");

export const MembersActionSchema = z.discriminatedUnion("intent", [
  z.strictObject({ intent: z.literal("invite"), email: z.email("Enter an e-mail address, e.g. name@company.com").max(254), roles }),
  z.strictObject({ intent: z.literal("set-roles"), userId: z.uuid("Unknown member"), roles }),
  z.strictObject({ intent: z.literal("revoke"), invitationId: z.uuid("Unknown invitation") }),
]);

export const InviteSchema = z.strictObject({
  intent: z.literal("invite"),
  email: z.email("Enter an e-mail address, e.g. name@company.com").max(254),
  roles,
});
