"use client";

import { useEffect, useState } from "react";

interface Health {
  status: string;
  database: string;
  mail: string;
}

/** Shows what /api/health says, so a newcomer sees at once whether the local services are up. */
export function HealthBadge() {
  const [health, setHealth] = useState<Health | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    let live = true;
    fetch("/api/health", { cache: "no-store" })
      .then(async (r) => (await r.json()) as Health)
      .then((h) => live && setHealth(h))
      .catch((e: Error) => live && setError(e.message));
    return () => {
      live = false;
    };
  }, []);
  if (error) return <p className="text-sm text-verdict-fail" data-testid="health">System: unreachable ({error})</p>;
  if (!health) return <p className="text-sm text-ink-muted" data-testid="health">System: checking…</p>;
  const ok = health.status === "ok";
  return (
    <p className="text-sm" data-testid="health">
      <span className={ok ? "text-verdict-pass" : "text-verdict-fail"}>{ok ? "● System ok" : "● System degraded"}</span>
      <span className="text-ink-muted"> · database {health.database} · mail {health.mail}</span>
    </p>
  );
}
