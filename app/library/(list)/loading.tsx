import { PageLoading } from "@/components/shell/PageLoading";

/** The library list while its entries are read (the list only: an entry's page opens without this boundary). */
export default function Loading() {
  return <PageLoading label="Reading the team's library…" rows={6} />;
}
