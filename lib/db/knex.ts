import "server-only";
import knexFactory, { type Knex } from "knex";
import config from "@/knexfile";

/**
 * The one Knex instance of this process. A connection pool is per-process plumbing, not shared state:
 * every instance behind a load balancer has its own, and all data lives in PostgreSQL.
 */
const globalForDb = globalThis as unknown as { quellKnex?: Knex };

/** Server-side limits of the app's connections, ms: no request waits on a statement or a lock for ever. */
export const STATEMENT_TIMEOUT_MS = Number(process.env.QUELL_PG_STATEMENT_TIMEOUT_MS ?? 15_000);
export const LOCK_TIMEOUT_MS = 10_000;
export const IDLE_IN_TRANSACTION_TIMEOUT_MS = 60_000;

/**
 * The app's Knex configuration: the shared one plus timeouts PostgreSQL enforces on every connection (a stuck
 * lock or a runaway query ends in an error the route answers, not in a request that never returns), and a bound
 * on waiting for a pooled connection. The CLI (migrations, seeds) keeps the plain configuration.
 */
export function appDbConfig(): Knex.Config {
  const base = config.connection;
  const connection = typeof base === "string" ? { connectionString: base } : (base as object);
  return {
    ...config,
    connection: {
      ...connection,
      statement_timeout: STATEMENT_TIMEOUT_MS,
      lock_timeout: LOCK_TIMEOUT_MS,
      idle_in_transaction_session_timeout: IDLE_IN_TRANSACTION_TIMEOUT_MS,
    } as Knex.StaticConnectionConfig,
    acquireConnectionTimeout: 10_000,
  };
}

export function db(): Knex {
  globalForDb.quellKnex ??= knexFactory(appDbConfig());
  return globalForDb.quellKnex;
}

/** True when PostgreSQL answers a trivial query within the timeout (ms). */
export async function databaseUp(timeoutMs = 2000): Promise<boolean> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  try {
    await Promise.race([
      db().raw("select 1"),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error("timeout")), timeoutMs);
      }),
    ]);
    return true;
  } catch {
    return false;
  } finally {
    clearTimeout(timer);
  }
}
