import 'reflect-metadata';
import pg from 'pg';
import { DataSource, type DataSourceOptions } from 'typeorm';
import { entities } from '../entities/index.js';
import { migrations } from './migrations/index.js';
import { loadDatabaseUrl } from '../config.js';

// Calendar dates stay 'YYYY-MM-DD' strings end to end: pg would otherwise turn them into Date objects at
// local midnight, which shifts the day in any zone west of UTC. Date arrays are read like text arrays.
// (The array OIDs are missing from pg's TypeId union, hence the casts.)
const DATE_ARRAY_OID = 1182 as unknown as typeof pg.types.builtins.DATE;
const TEXT_ARRAY_OID = 1009 as unknown as typeof pg.types.builtins.DATE;
pg.types.setTypeParser(pg.types.builtins.DATE, (value: string) => value);
pg.types.setTypeParser(DATE_ARRAY_OID, pg.types.getTypeParser(TEXT_ARRAY_OID));

export function dataSourceOptions(databaseUrl: string): DataSourceOptions {
  return {
    type: 'postgres',
    url: databaseUrl,
    entities,
    migrations,
    // gen_random_uuid() is built into PostgreSQL 13+, so no extension has to be created.
    uuidExtension: 'pgcrypto',
    installExtensions: false,
    synchronize: false,
    logging: false,
    extra: { max: 10, connectionTimeoutMillis: 3000 },
  };
}

export function createDataSource(databaseUrl: string): DataSource {
  return new DataSource(dataSourceOptions(databaseUrl));
}

// The TypeORM CLI imports this module and needs a default export.
export default createDataSource(loadDatabaseUrl());
