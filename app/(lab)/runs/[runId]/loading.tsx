import { PageSkeleton } from "@/components/page-skeleton";

export default function RunLoading() {
  return <PageSkeleton label="Loading the run" panels={[180, 120, 360, 200]} />;
}
