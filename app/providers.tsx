"use client";

import { QueryClientProvider } from "@tanstack/react-query";
import type { ReactNode } from "react";
import { browserQueryClient } from "@/lib/api/query-client";

export function Providers({ children }: { children: ReactNode }) {
  return <QueryClientProvider client={browserQueryClient()}>{children}</QueryClientProvider>;
}
