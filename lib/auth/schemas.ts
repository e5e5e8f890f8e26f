/** Validation of identity inputs, shared by the forms and the route handlers. */
import { z } from "zod";

export const emailSchema = z
  .string({ error: "E-mail is required" })
  .trim()
  .toLowerCase()
  .min(1, "E-mail is required")
  .max(254, "E-mail must be at most 254 characters")
  .pipe(z.email({ error: "E-mail must be a valid address, like name@firm.com" }));

export const passwordSchema = z
  .string({ error: "Password is required" })
  .min(10, "Password must be at least 10 characters")
  .max(200, "Password must be at most 200 characters");

export const personNameSchema = z
  .string({ error: "Name is required" })
  .trim()
  .min(1, "Name is required")
  .max(100, "Name must be at most 100 characters");

export const workspaceNameSchema = z
  .string({ error: "Firm name is required" })
  .trim()
  .min(2, "Firm name must be at least 2 characters")
  .max(80, "Firm name must be at most 80 characters");

export const signUpSchema = z.object({
  name: personNameSchema,
  email: emailSchema,
  password: passwordSchema,
  workspaceName: workspaceNameSchema,
});
export type SignUpInput = z.output<typeof signUpSchema>;

export const signInSchema = z.object({ email: emailSchema, password: z.string().min(1, "Password is required").max(200) });

export const magicLinkRequestSchema = z.object({ email: emailSchema });
