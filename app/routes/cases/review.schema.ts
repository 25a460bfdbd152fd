import { z } from "zod";
import { STEP_KEYS } from "~/domain/vocabulary";

const step = z.enum(STEP_KEYS, "Unknown step");
/** How the signer proves it is them at this moment: their password, or a fresh company sign-in. */
const confirm = z.enum(["password", "sso"], "Sign with your password or with company sign-in").default("password");
/** The review page's forms, told apart by their intent. */
export const ReviewActionSchema = z.discriminatedUnion("intent", [
  z.strictObject({ intent: z.literal("submit"), step, confirm, password: z.string().max(256).default(""), comment: z.string().max(4000, "At most 4000 characters").default("") }),
  z.strictObject({ intent: z.literal("approve"), step, confirm, password: z.string().max(256).default(""), comment: z.string().max(4000, "At most 4000 characters").default("") }),
  z.strictObject({ intent: z.literal("return"), step, comment: z.string().trim().min(3, "Say what needs to change: a comment is required").max(4000, "At most 4000 characters"), anchor: z.string().max(200).default("") }),
  z.strictObject({ intent: z.literal("comment"), step, body: z.string().trim().min(1, "Write a comment").max(4000, "At most 4000 characters"), anchor: z.string().max(200).default("") }),
  z.strictObject({ intent: z.literal("approve-case"), confirm, password: z.string().max(256).default("") }),
]);
