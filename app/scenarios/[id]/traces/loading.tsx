import { PageLoading } from "@/components/shell/PageLoading";

export default function Loading() {
  return <PageLoading label="Reading the bench traces…" rows={3} />;
}
