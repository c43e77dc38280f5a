import { roleLabels } from '@hodboard/shared';
import { loadDatabaseUrl } from '../config.js';
import { createDataSource } from './data-source.js';
import { DEMO_PASSWORD, DEMO_SIGN_INS, seedDemoFirm } from './demo-firm.js';

const dataSource = createDataSource(loadDatabaseUrl());
await dataSource.initialize();
const { created } = await seedDemoFirm(dataSource);
await dataSource.destroy();

console.log(created ? 'Demo firm created.' : 'Demo firm already present; nothing changed.');
console.log('Demo sign-ins (password for all: ' + DEMO_PASSWORD + '):');
for (const person of DEMO_SIGN_INS) {
  console.log(`  ${roleLabels[person.role].padEnd(10)}  ${person.email.padEnd(30)}  ${DEMO_PASSWORD}`);
}
