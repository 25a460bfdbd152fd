import { z } from "zod";
import { API_TOKEN_SCOPES } from "~/domain/vocabulary";
import { plainLine } from "~/utils/text";

export const CreateTokenSchema = z.strictObject({
  intent: z.literal("create"),
  name: plainLine("A token name", 1, 80, { min: "Name the token, e.g. after the script or machine that uses it" }),
  scope: z.enum(API_TOKEN_SCOPES, "Choose what the token may do: read only, or read and write"),
});

export const RevokeTokenSchema = z.strictObject({
  intent: z.literal("revoke"),
  tokenId: z.uuid("Choose one of your tokens"),
});

/** The two forms of the tokens page, told apart by their intent field. */
export const TokenActionSchema = z.discriminatedUnion("intent", [CreateTokenSchema, RevokeTokenSchema]);
