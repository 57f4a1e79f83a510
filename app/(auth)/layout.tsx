import Image from "next/image";
import type { ReactNode } from "react";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <main className="grid min-h-screen place-items-center px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 flex items-center gap-3">
          <Image src="/kneepoint-mark.svg" alt="" width={44} height={44} priority />
          <div>
            <p className="text-xl font-semibold tracking-tight">Kneepoint</p>
            <p className="text-sm text-ink-soft">Lab notebook for cell charge and discharge tests</p>
          </div>
        </div>
        <div className="rounded-lg border border-rule bg-sheet p-6 shadow-sm">{children}</div>
      </div>
    </main>
  );
}
