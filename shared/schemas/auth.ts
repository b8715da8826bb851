import { z } from "zod";
import { ROLES } from "../roles";

export const emailSchema = z.string().trim().toLowerCase().pipe(z.email({ message: "must be an e-mail address" })).pipe(z.string().max(254));

/** New passwords: long rather than clever (NIST SP 800-63B favours length over composition rules). */
export const newPasswordSchema = z
  .string()
  .min(12, { message: "must be at least 12 characters" })
  .max(256, { message: "must be at most 256 characters" });

export const roleListSchema = z
  .array(z.enum(ROLES))
  .min(1, { message: "needs at least one role" })
  .transform((roles) => [...new Set(roles)]);

export const signInSchema = z.strictObject({
  email: emailSchema,
  password: z.string().min(1, { message: "is required" }).max(256),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const acceptInvitationSchema = z.strictObject({
  token: z.string().min(20).max(200),
  name: z.string().trim().min(1, { message: "is required" }).max(120),
  password: newPasswordSchema,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

export const requestResetSchema = z.strictObject({ email: emailSchema });
export type RequestResetInput = z.infer<typeof requestResetSchema>;

export const resetPasswordSchema = z.strictObject({
  token: z.string().min(20).max(200),
  password: newPasswordSchema,
});
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
