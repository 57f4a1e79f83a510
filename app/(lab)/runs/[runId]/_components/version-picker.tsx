"use client";

import { usePathname, useRouter } from "next/navigation";
import { useId } from "react";
import { inputClass } from "@/components/ui/field";

/** Switches the page between stored analysis versions (kept in the URL, so a version can be linked). */
export function VersionPicker({ versions, current, latest }: { versions: { version: number; engineVersion: string; createdAt: string }[]; current: number; latest: number }) {
  const router = useRouter();
  const pathname = usePathname();
  const id = useId();
  return (
    <span className="inline-flex items-center gap-2">
      <label htmlFor={id} className="sr-only">
        Analysis version
      </label>
      <select
        id={id}
        value={current}
        onChange={(e) => {
          const v = Number(e.target.value);
          router.replace(v === latest ? pathname : `${pathname}?version=${v}`, { scroll: false });
        }}
        className={`${inputClass} w-auto! max-w-full py-1!`}
      >
        {versions.map((v) => (
          <option key={v.version} value={v.version}>
            Version {v.version}
            {v.version === latest ? " (latest)" : ""} · {v.createdAt.slice(0, 16).replace("T", " ")} UTC
          </option>
        ))}
      </select>
    </span>
  );
}
