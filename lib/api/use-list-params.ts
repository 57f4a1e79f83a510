"use client";

import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback } from "react";

/**
 * List state (filter, sort, page) lives in the URL, so a filtered table can be bookmarked,
 * shared and restored with the back button.
 */
export function useListParams<K extends string>(defaults: Record<K, string>) {
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const get = (key: K): string => search.get(key) ?? defaults[key];
  const set = useCallback(
    (changes: Partial<Record<K, string | undefined>>) => {
      const next = new URLSearchParams(search.toString());
      for (const [key, value] of Object.entries(changes) as [K, string | undefined][]) {
        if (value === undefined || value === "" || value === defaults[key]) next.delete(key);
        else next.set(key, value);
      }
      if (!("page" in changes)) next.delete("page");
      const text = next.toString();
      router.replace(text ? `${pathname}?${text}` : pathname, { scroll: false });
    },
    [defaults, pathname, router, search],
  );
  return { get, set };
}
