import { z } from "zod";
import { ROLES } from "./roles";
import { idField, nameField } from "./fields";
import { apiScopesField } from "./api-scopes";

export const MIN_PASSWORD_LENGTH = 12;
/** bcrypt reads only the first 72 bytes; a longer password is refused rather than cut short. */
export const MAX_PASSWORD_BYTES = 72;
const utf8Bytes = (text: string) => new TextEncoder().encode(text).length;

const email = z
  .string({ error: "Enter an e-mail address." })
  .max(254, "An e-mail address has at most 254 characters.")
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: "Enter a valid e-mail address." }));

export const signInSchema = z.object({
  email,
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(1000, "A password has at most 1,000 characters."),
  redirectTo: z.string().max(2000).optional(),
});

export const newPasswordSchema = z
  .object({
    password: z
      .string({ error: "Enter a password." })
      .min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters.`)
      .refine((p) => utf8Bytes(p) <= MAX_PASSWORD_BYTES, `Use at most ${MAX_PASSWORD_BYTES} bytes (64 plain letters fit; accents and emoji take more).`),
    confirm: z.string({ error: "Repeat the password." }).max(200),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

export const inviteSchema = z.object({
  email,
  name: nameField("Enter the person's name."),
  role: z.enum(ROLES, { error: "Choose a role." }),
});

export const changeRoleSchema = z.object({
  userId: idField("Choose a person from the list."),
  role: z.enum(ROLES, { error: "Choose a role." }),
});

export const forgotPasswordSchema = z.object({ email });

export const API_KEY_ROLES = ["engineer", "consultant", "manager"] as const;
const DAY_MS = 86_400_000;
/** Optional last day of a key (UTC): from today to five years ahead; "" = no expiry. */
const keyExpiry = z
  .string()
  .optional()
  .transform((text, ctx) => {
    if (!text) return null;
    const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
    const day = m ? Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : NaN;
    if (!m || Number.isNaN(day) || new Date(day).toISOString().slice(0, 10) !== text) {
      ctx.addIssue({ code: "custom", message: "Give the last day as YYYY-MM-DD, or leave it empty." });
      return z.NEVER;
    }
    const today = Date.now() - (Date.now() % DAY_MS);
    if (day < today || day > today + 5 * 366 * DAY_MS) {
      ctx.addIssue({ code: "custom", message: "The last day is today or later, at most five years ahead." });
      return z.NEVER;
    }
    // Valid through the whole last day (UTC).
    return new Date(day + DAY_MS);
  });

export const apiKeySchema = z.object({
  name: nameField("Name the key after the system that will use it."),
  role: z.enum(API_KEY_ROLES, { error: "Choose the role the key acts with." }),
  scopes: apiScopesField,
  expiresOn: keyExpiry,
});
export type ApiKeyInput = z.infer<typeof apiKeySchema>;

/** The key form sends one checkbox per scope, named `scope:<scope>`. */
export function apiKeyFormToInput(fields: Record<string, string>) {
  const scopes = Object.keys(fields).filter((k) => k.startsWith("scope:")).map((k) => k.slice("scope:".length));
  return { name: fields.name, role: fields.role, scopes, expiresOn: fields.expiresOn };
}
