import { z } from "zod";
import { roles } from "@/lib/auth/roles";
import { textField } from "./fields";

const roleField = z.enum(roles, { error: "Choose a role" });

export const newUserInput = z.object({
  name: textField("Name", 120),
  email: z.preprocess(
    (v) => (typeof v === "string" ? v.trim() : v),
    z.email({ error: "Enter an e-mail address such as name@lab.example" }).max(254, "E-mail must be at most 254 characters"),
  ),
  // The same bounds as the sign-in configuration, so every account created here can sign in.
  password: z
    .string({ error: "Initial password is required" })
    .min(10, "Initial password must have at least 10 characters")
    .max(128, "Initial password must be at most 128 characters"),
  role: roleField,
});
export type NewUserInput = z.output<typeof newUserInput>;

export const roleChangeInput = z.object({
  userId: z.string({ error: "Choose a user" }).trim().min(1, "Choose a user").max(64, "Choose a user"),
  role: roleField,
});
export type RoleChangeInput = z.output<typeof roleChangeInput>;
