import { z } from "zod";
import { PASSWORD_MAX_LENGTH as PASSWORD_MAX, PASSWORD_MIN_LENGTH as PASSWORD_MIN } from "~/domain/password-policy";
import { plainLine } from "~/utils/text";

/** A new account chooses a name and a password of at least 12 characters. */
export const AcceptNewSchema = z
  .object({
    name: plainLine("A name", 2, 120, { min: "Enter your full name" }),
    password: z.string().min(PASSWORD_MIN, `Choose a password of at least ${PASSWORD_MIN} characters`).max(PASSWORD_MAX, `A password has at most ${PASSWORD_MAX} characters`),
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

/** An existing account confirms with its current password. */
export const AcceptExistingSchema = z.strictObject({
  password: z.string().min(1, "Enter your current password").max(PASSWORD_MAX, `A password has at most ${PASSWORD_MAX} characters`),
});
