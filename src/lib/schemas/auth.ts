import { z } from "zod";
import { ROLES } from "../permissions.ts";

export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 200;
export const NAME_MAX = 120;

export const emailField = z.string().trim().toLowerCase().max(254).pipe(z.email("Enter an e-mail address such as name@example.com."));
export const passwordField = z
  .string()
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const signInSchema = z.strictObject({
  email: emailField,
  password: z.string().min(1, "Enter your password.").max(PASSWORD_MAX),
});

export const resetRequestSchema = z.strictObject({ email: emailField });

export const resetSchema = z.strictObject({
  token: z.string().min(20).max(100),
  password: passwordField,
});

export const inviteSchema = z.strictObject({
  email: emailField,
  role: z.enum(ROLES, { error: "Choose one of the roles." }),
});

export const acceptInvitationSchema = z.strictObject({
  token: z.string().min(20).max(100),
  name: z.string().trim().min(1, "Enter your name.").max(NAME_MAX),
  password: passwordField,
});

export const roleChangeSchema = z.strictObject({
  role: z.enum(ROLES, { error: "Choose one of the roles." }),
});

/** JSON carries the id as a number: true, [7] or "7" are refused, never coerced into an id. */
export const switchOrgSchema = z.strictObject({
  organisationId: z.number({ error: "Choose an organisation." }).int().positive(),
});
