import { PageSkeleton } from "@/components/page-skeleton";

export default function CellLoading() {
  return <PageSkeleton label="Loading the cell" panels={[120, 240, 300]} />;
}
