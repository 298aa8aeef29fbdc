// Knex CLI entry: `npm run db:migrate` / `npm run db:seed` (run under tsx with the react-server condition).
import path from "node:path";
import { env } from "./lib/server/env";
import { buildKnexConfig } from "./lib/server/db-config";

const config = {
  ...buildKnexConfig(env.DATABASE_URL),
  seeds: { directory: path.resolve("db/seeds"), extension: "ts", loadExtensions: [".ts"] },
};

export default config;
