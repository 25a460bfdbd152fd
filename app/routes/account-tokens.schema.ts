import { z } from "zod";

export const CreateTokenSchema = z.strictObject({
  intent: z.literal("create"),
  name: z.string().trim().min(1, "Name the token, e.g. after the script or machine that uses it").max(80, "A token name has at most 80 characters"),
});

export const RevokeTokenSchema = z.strictObject({
  intent: z.literal("revoke"),
  tokenId: z.uuid("Choose one of your tokens"),
});

/** The two forms of the tokens page, told apart by their intent field. */
export const TokenActionSchema = z.discriminatedUnion("intent", [CreateTokenSchema, RevokeTokenSchema]);
