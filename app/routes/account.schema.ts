import { z } from "zod";
import { PASSWORD_MAX_LENGTH as PASSWORD_MAX, PASSWORD_MIN_LENGTH as PASSWORD_MIN } from "~/domain/password-policy";

/** Changing one's own password: the current one, then the new one twice. */
export const ChangePasswordSchema = z
  .strictObject({
    current: z.string().min(1, "Enter your current password").max(PASSWORD_MAX, `A password has at most ${PASSWORD_MAX} characters`),
    password: z.string().min(PASSWORD_MIN, `Choose a password of at least ${PASSWORD_MIN} characters`).max(PASSWORD_MAX, `A password has at most ${PASSWORD_MAX} characters`),
    confirm: z.string().max(PASSWORD_MAX),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" })
  .refine((v) => v.password !== v.current, { path: ["password"], message: "Choose a password other than your current one" });
