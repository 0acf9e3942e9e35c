import knexFactory, { type Knex } from "knex";
import config from "@/knexfile";

/**
 * The one Knex instance of this process. A connection pool is per-process plumbing, not shared state:
 * every instance behind a load balancer has its own, and all data lives in PostgreSQL.
 */
const globalForDb = globalThis as unknown as { quellKnex?: Knex };

export function db(): Knex {
  globalForDb.quellKnex ??= knexFactory(config);
  return globalForDb.quellKnex;
}

/** True when PostgreSQL answers a trivial query within the timeout (ms). */
export async function databaseUp(timeoutMs = 2000): Promise<boolean> {
  try {
    await Promise.race([
      db().raw("select 1"),
      new Promise((_, reject) => setTimeout(() => reject(new Error("timeout")), timeoutMs)),
    ]);
    return true;
  } catch {
    return false;
  }
}
