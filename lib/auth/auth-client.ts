"use client";

import { createAuthClient } from "better-auth/react";

/** Browser side of sign-in; it talks only to our own /api/auth endpoints. */
export const authClient = createAuthClient();
