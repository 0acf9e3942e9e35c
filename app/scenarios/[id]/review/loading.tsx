import { PageLoading } from "@/components/shell/PageLoading";

export default function Loading() {
  return <PageLoading label="Preparing the review…" rows={5} />;
}
