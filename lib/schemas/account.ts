import { z } from "zod";
import { Role } from "./vocabulary";

// Accounts and the team: one schema per request, shared by the forms (react-hook-form) and the
// route handlers, so a field error reads the same on the phone and from the server.

export const Email = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .toLowerCase()
  .min(1, { error: "Enter your e-mail address." })
  .max(254, { error: "That e-mail address is too long." })
  .pipe(z.email({ error: "That does not look like an e-mail address (name@example.com)." }));

export const PASSWORD_MIN = 10;
export const NewPassword = z
  .string({ error: "Choose a password." })
  .min(PASSWORD_MIN, { error: `Use at least ${PASSWORD_MIN} characters; a short sentence is easy to remember.` })
  .max(200, { error: "Keep the password under 200 characters." });

export const PersonName = z
  .string({ error: "Enter your name." })
  .trim()
  .min(1, { error: "Enter your name, as your team knows you." })
  .max(120, { error: "Keep the name under 120 characters." });

export const FarmName = z
  .string({ error: "Give the farm a name." })
  .trim()
  .min(1, { error: "Give the farm a name." })
  .max(120, { error: "Keep the farm name under 120 characters." });

/** One-time tokens from e-mailed links: url-safe base64. */
export const LinkToken = z
  .string({ error: "This link is incomplete." })
  .min(20, { error: "This link is incomplete. Open it again from the e-mail." })
  .max(200, { error: "This link is not valid." })
  .regex(/^[A-Za-z0-9_-]+$/, { error: "This link is not valid." });

export const SignUpInput = z.object({ email: Email, password: NewPassword, name: PersonName, farmName: FarmName });
export type SignUpInput = z.infer<typeof SignUpInput>;

/** A password the person types to prove who they are (any length they chose back then). */
const enteredPassword = (error: string) =>
  z.string({ error }).min(1, { error }).max(200, { error: "Keep the password under 200 characters." });

export const SignInInput = z.object({
  email: Email,
  password: enteredPassword("Enter your password."),
  /** Members of more than one farm may pick which to open; otherwise the first farm they joined. */
  farmId: z.uuid().optional(),
});
export type SignInInput = z.infer<typeof SignInInput>;

export const ResetRequestInput = z.object({ email: Email });
export type ResetRequestInput = z.infer<typeof ResetRequestInput>;

export const ResetConfirmInput = z.object({ token: LinkToken, password: NewPassword });
export type ResetConfirmInput = z.infer<typeof ResetConfirmInput>;

export const InviteInput = z.object({ email: Email, role: Role });
export type InviteInput = z.infer<typeof InviteInput>;

/**
 * Accepting an invite: a new person chooses a name and password; someone who already has a
 * Rimebook account enters their existing password instead (the name is then left as it is).
 */
export const InviteAcceptInput = z.object({
  token: LinkToken,
  name: PersonName.optional(),
  password: enteredPassword("Enter a password."),
});
export type InviteAcceptInput = z.infer<typeof InviteAcceptInput>;

/** The acceptance form for a person new to Rimebook: name and a new password are required. */
export const NewMemberAcceptInput = InviteAcceptInput.extend({ name: PersonName, password: NewPassword });

export const RoleChangeInput = z.object({ role: Role });
export type RoleChangeInput = z.infer<typeof RoleChangeInput>;

export const SwitchFarmInput = z.object({ farmId: z.uuid({ error: "Pick a farm." }) });

/** A signed-in person renames themselves (their team sees the new name on every farm). */
export const ProfileInput = SignUpInput.pick({ name: true });
export type ProfileInput = z.infer<typeof ProfileInput>;

const ChangePasswordFields = z.object({ currentPassword: enteredPassword("Enter your current password."), newPassword: NewPassword });
const differsFromCurrent = (v: { currentPassword: string; newPassword: string }) => v.currentPassword !== v.newPassword;
const differsMessage = { path: ["newPassword"], error: "The new password is the same as the current one. Choose a different one." };

/** Change password while signed in: the server's request. */
export const ChangePasswordInput = ChangePasswordFields.refine(differsFromCurrent, differsMessage);
export type ChangePasswordInput = z.infer<typeof ChangePasswordInput>;

/** The Settings form adds the repeated new password, checked on the phone only. */
export const ChangePasswordForm = ChangePasswordFields.extend({ repeatPassword: z.string() })
  .refine(differsFromCurrent, differsMessage)
  .refine((v) => v.newPassword === v.repeatPassword, { path: ["repeatPassword"], error: "The two new passwords are not the same. Type the new one again." });
export type ChangePasswordForm = z.infer<typeof ChangePasswordForm>;
