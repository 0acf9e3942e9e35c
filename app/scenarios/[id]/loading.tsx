import { PageLoading } from "@/components/shell/PageLoading";

export default function Loading() {
  return <PageLoading label="Opening the scenario…" rows={3} />;
}
