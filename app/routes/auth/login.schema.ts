import { z } from "zod";

export const LoginSchema = z.strictObject({
  email: z.email("Enter your e-mail address, e.g. name@company.com").max(254),
  password: z.string().min(1, "Enter your password").max(256, "A password has at most 256 characters"),
  redirectTo: z.string().optional(),
});

export const SsoStartSchema = z.strictObject({
  email: z.email("Enter your company e-mail address").max(254),
  redirectTo: z.string().optional(),
});
