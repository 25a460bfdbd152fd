import { z } from "zod";

/** The reports page's forms: request the next version, re-run an issued one, or release it with a signature. */
export const ReportsActionSchema = z.discriminatedUnion("intent", [
  z.strictObject({ intent: z.literal("request") }),
  z.strictObject({ intent: z.literal("rerun"), reportId: z.uuid("Unknown report") }),
  z.strictObject({
    intent: z.literal("release"),
    reportId: z.uuid("Unknown report"),
    confirm: z.enum(["password", "sso"], "Sign with your password or with company sign-in").default("password"),
    password: z.string().max(256).default(""),
  }),
]);
