/**
 * Wire schemas and shapes of crew, mail and audit: what the crew routes accept, what the
 * browser forms check before sending, and the rows the admin pages show. Shared so that the
 * form and the route say the same thing about the same field.
 */
import { z } from "zod";
import { ROLES } from "../vocabulary";

/** A new password: long enough to resist guessing, short enough for bcrypt (72 bytes). */
export const PasswordSchema = z
  .string()
  .min(10, "Use at least 10 characters.")
  .max(72, "Use at most 72 characters.");

export const InviteSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address.").max(254),
  name: z.string().trim().min(1, "Enter the person's name.").max(120),
  role: z.enum(ROLES),
});
export type InviteInput = z.infer<typeof InviteSchema>;

export const UserPatchSchema = z
  .object({
    role: z.enum(ROLES).optional(),
    disabled: z.boolean().optional(),
    onCall: z.boolean().optional(),
  })
  .strict()
  .refine((v) => v.role !== undefined || v.disabled !== undefined || v.onCall !== undefined, "Give role, disabled or onCall.");
export type UserPatch = z.infer<typeof UserPatchSchema>;

export const SetPasswordSchema = z.object({ password: PasswordSchema });

export const ResetRequestSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter the e-mail address of your Tessera account.").max(254),
});

export const MePatchSchema = z
  .object({
    name: z.string().trim().min(1, "Enter your name.").max(120).optional(),
    currentPassword: z.string().min(1, "Enter your current password.").max(200).optional(),
    newPassword: PasswordSchema.optional(),
  })
  .strict()
  .refine((v) => v.name !== undefined || v.newPassword !== undefined, "Give a name or a new password.")
  .refine((v) => v.newPassword === undefined || v.currentPassword !== undefined, {
    message: "Enter your current password to change it.",
    path: ["currentPassword"],
  });
export type MePatch = z.infer<typeof MePatchSchema>;

/** invited: no password set yet; deactivated: may not sign in. */
export const MEMBER_STATES = ["active", "invited", "deactivated"] as const;
export type MemberState = (typeof MEMBER_STATES)[number];

export interface CrewMember {
  id: number;
  email: string;
  name: string;
  role: (typeof ROLES)[number];
  state: MemberState;
  onCall: boolean;
  createdAt: number;
}

export interface CaughtMail {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string | null;
  html: string | null;
  receivedAt: number;
}

export interface AuditItem {
  id: number;
  at: number;
  userId: number | null;
  userName: string | null;
  action: string;
  target: string;
  detail: unknown;
}

export const LINK_KINDS = ["invite", "reset"] as const;
export type LinkKind = (typeof LINK_KINDS)[number];

/** What a public invite or reset page may learn about its link before the password is set. */
export type LinkState =
  | { state: "valid"; kind: LinkKind; email: string; name: string }
  | { state: "used" | "expired" | "unknown" };
