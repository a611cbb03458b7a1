import { Sequelize } from 'sequelize';
import { Umzug, SequelizeStorage } from 'umzug';
import { pathToFileURL, fileURLToPath } from 'node:url';
import path from 'node:path';
import type { Config } from '../config';
import { initModels } from './models';

/** A Sequelize instance; `bindModels: false` for side connections (admin, scratch databases). */
export function createSequelize(
  config: Pick<Config, 'DB_HOST' | 'DB_PORT' | 'DB_NAME' | 'DB_USER' | 'DB_PASSWORD' | 'DB_POOL_MAX'>,
  opts: { bindModels?: boolean } = {},
) {
  const sequelize = new Sequelize(config.DB_NAME, config.DB_USER, config.DB_PASSWORD, {
    dialect: 'mariadb',
    host: config.DB_HOST,
    port: config.DB_PORT,
    logging: false,
    timezone: '+00:00', // store UTC; the client shows the facility's time zone
    dialectOptions: {
      // Fail fast when MariaDB is away so requests get a clear 503 instead of hanging.
      connectTimeout: 2000,
      // BIGINT counts come back as numbers, DECIMAL sums as numbers.
      supportBigNumbers: true,
      bigNumberStrings: false,
      decimalAsNumber: true,
    },
    pool: { max: config.DB_POOL_MAX, min: 0, acquire: 4000, idle: 10_000, evict: 5_000 },
    define: { underscored: true, timestamps: true },
  });
  if (opts.bindModels !== false) initModels(sequelize);
  return sequelize;
}

const migrationsDir = path.join(path.dirname(fileURLToPath(import.meta.url)), 'migrations');

/** Migrations live in server/db/migrations as .ts files named NNNN-what.ts. Never sync(). */
export function createMigrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: {
      glob: ['*.ts', { cwd: migrationsDir, ignore: ['*.d.ts'] }],
      // umzug's default resolver cannot load TypeScript; import it through tsx's loader.
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => (await import(pathToFileURL(file!).href)).up({ context }),
        down: async () => (await import(pathToFileURL(file!).href)).down({ context }),
      }),
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

export function isDatabaseDown(error: unknown): boolean {
  const e = error as { name?: string; code?: string; original?: { code?: string }; parent?: { code?: string } } | null;
  if (!e) return false;
  const names = [
    'SequelizeConnectionError',
    'SequelizeConnectionRefusedError',
    'SequelizeConnectionAcquireTimeoutError',
    'SequelizeHostNotReachableError',
    'SequelizeConnectionTimedOutError',
    'SequelizeAccessDeniedError',
  ];
  if (e.name && names.includes(e.name)) return true;
  const codes = [
    'ECONNREFUSED',
    'ER_GET_CONNECTION_TIMEOUT',
    'ER_CONNECTION_TIMEOUT',
    'ER_SOCKET_UNEXPECTED_CLOSE',
    'ECONNRESET',
    'EPIPE',
    'ER_CONNECTION_ALREADY_CLOSED',
    'PROTOCOL_CONNECTION_LOST',
    'ER_CLOSING_POOL',
    'ER_POOL_ALREADY_CLOSED',
  ];
  const code = e.code ?? e.original?.code ?? e.parent?.code;
  return !!code && codes.includes(code);
}

/**
 * Models are bound to one Sequelize instance per process (Model.init is static), so every
 * server started in one process (tests start several) shares the instance for the same
 * database; it is closed when the last user releases it.
 */
const shared = new Map<string, { sequelize: Sequelize; users: number }>();

export function acquireSequelize(config: Parameters<typeof createSequelize>[0]): Sequelize {
  const key = `${config.DB_USER}@${config.DB_HOST}:${config.DB_PORT}/${config.DB_NAME}`;
  let entry = shared.get(key);
  if (!entry) {
    entry = { sequelize: createSequelize(config), users: 0 };
    shared.set(key, entry);
  }
  entry.users++;
  return entry.sequelize;
}

export async function releaseSequelize(sequelize: Sequelize) {
  for (const [key, entry] of shared) {
    if (entry.sequelize !== sequelize) continue;
    entry.users--;
    if (entry.users <= 0) {
      shared.delete(key);
      await sequelize.close();
    }
    return;
  }
  await sequelize.close();
}
