import type { Metadata } from "next";
import { redirect } from "next/navigation";
import type { ReactNode } from "react";
import { PageTitle } from "@/components/ui/panel";
import { roleLabels, type Role } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { CellTypeCountsBlock, PendingBatchesBlock, RecentCellsBlock, UserCountsBlock } from "./_components/start-blocks";
import { NearingEndOfLifeBlock, OpenFlagsBlock, RecentUploadsBlock } from "./_components/work-blocks";

export const metadata: Metadata = { title: "Start" };

const intro: Record<Role, string> = {
  technician: "Send bench logs for analysis and follow them; register cells as they arrive at the bench.",
  "qa-lead": "Lots waiting for your decision, with how many of their cells are registered so far.",
  engineer: "Flags that need someone, cells near the end of their life, and the state of each cell type.",
  admin: "Who has an account and in which role.",
};

function blocksFor(role: Role, userId: string): ReactNode {
  switch (role) {
    case "technician":
      return (
        <>
          <RecentUploadsBlock userId={userId} />
          <RecentCellsBlock userId={userId} />
        </>
      );
    case "qa-lead":
      return <PendingBatchesBlock />;
    case "engineer":
      return (
        <>
          <OpenFlagsBlock />
          <NearingEndOfLifeBlock />
          <CellTypeCountsBlock />
        </>
      );
    case "admin":
      return <UserCountsBlock />;
  }
}

export default async function StartPage() {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  return (
    <>
      <PageTitle kicker={roleLabels[user.role]} title={`Hello, ${user.name}`} />
      <p className="mb-6 max-w-2xl text-sm text-ink-soft">{intro[user.role]}</p>
      <div className="space-y-6">{blocksFor(user.role, user.id)}</div>
    </>
  );
}
