import { loadDatabaseUrl } from '../config.js';
import { createDataSource } from './data-source.js';

const dataSource = createDataSource(loadDatabaseUrl());
await dataSource.initialize();
const applied = await dataSource.runMigrations({ transaction: 'each' });
console.log(applied.length ? `Applied ${applied.map((m) => m.name).join(', ')}` : 'Database schema is up to date');
await dataSource.destroy();
