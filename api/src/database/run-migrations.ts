import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { loadConfig } from '../config/app-config';
import { dataSourceOptions } from './data-source-options';

/** `npm run migrate -w api`: applies pending migrations, each in its own transaction. */
async function main(): Promise<void> {
  const config = loadConfig();
  const dataSource = new DataSource(dataSourceOptions(config.databaseUrl));
  await dataSource.initialize();
  try {
    const applied = await dataSource.runMigrations({ transaction: 'each' });
    console.log(applied.length ? `Applied ${applied.map((m) => m.name).join(', ')}` : 'Schema is up to date.');
  } finally {
    await dataSource.destroy();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
