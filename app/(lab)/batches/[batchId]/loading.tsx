import { PageSkeleton } from "@/components/page-skeleton";

export default function BatchLoading() {
  return <PageSkeleton label="Loading the batch" panels={[160, 420, 280]} />;
}
