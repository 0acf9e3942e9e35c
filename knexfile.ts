import type { Knex } from "knex";

/** One Knex configuration for the CLI, the app, the mail fake and the tests; DATABASE_URL comes from db/env.sh. */
const connection =
  process.env.DATABASE_URL ??
  `postgres://${process.env.QUELL_PG_USER ?? "quell"}:${process.env.QUELL_PG_PASSWORD ?? "quell-dev"}@127.0.0.1:${process.env.QUELL_PG_PORT ?? "54329"}/${process.env.QUELL_DB ?? "quell"}`;

const config: Knex.Config = {
  client: "pg",
  connection,
  pool: { min: 0, max: Number(process.env.QUELL_PG_POOL ?? 10) },
  migrations: {
    directory: "./db/migrations",
    extension: "ts",
    loadExtensions: [".ts"],
    tableName: "knex_migrations",
  },
  seeds: { directory: "./db/seeds", extension: "ts", loadExtensions: [".ts"] },
};

export default config;
