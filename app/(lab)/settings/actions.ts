"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { newApiToken } from "@/lib/auth/api-token";
import { insertApiToken, revokeApiToken } from "@/lib/db/queries/api-tokens";
import { createApiTokenInput, revokeApiTokenInput } from "@/lib/validations/runs";

/** Creates a personal API token. The token is in this result only: it is stored as its SHA-256. */
export const createApiTokenAction = defineAction("token.manage", createApiTokenInput, async (input, user) => {
  const { token, tokenHash, prefix } = newApiToken();
  const { id } = await insertApiToken({ name: input.name, tokenHash, prefix }, { id: user.id, name: user.name });
  revalidatePath("/settings");
  return { id, name: input.name, prefix, token };
});

/** Revokes one of the user's own tokens; it stops working at once. */
export const revokeApiTokenAction = defineAction("token.manage", revokeApiTokenInput, async (input, user) => {
  const revoked = await revokeApiToken(input.tokenId, { id: user.id, name: user.name });
  revalidatePath("/settings");
  return revoked;
});
