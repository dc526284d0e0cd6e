import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { dataSourceOptions } from '../src/database/data-source-options';
import { loadDemoAccounts } from '../src/database/seed/load-demo-accounts';

/** Starts every end-to-end run from an empty schema, migrated and loaded with the demo accounts. */
export default async function setup(): Promise<void> {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL must point at a throwaway test database (npm test sets it).');
  const dataSource = new DataSource(dataSourceOptions(url));
  await dataSource.initialize();
  await dataSource.query('DROP SCHEMA IF EXISTS job_queue CASCADE');
  await dataSource.query('DROP SCHEMA public CASCADE');
  await dataSource.query('CREATE SCHEMA public');
  await dataSource.runMigrations({ transaction: 'each' });
  await loadDemoAccounts(dataSource);
  await dataSource.destroy();
}
