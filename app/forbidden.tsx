import type { Metadata } from "next";
import { Forbidden } from "@/components/forbidden";

export const metadata: Metadata = { title: "Not allowed" };

/**
 * What `forbidden()` renders, with a 403 status. Next renders it inside the layouts above the
 * segment that refused, so the group layouts' app shell is already around it.
 */
export default function ForbiddenPage() {
  return <Forbidden />;
}
