import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { loadConfig } from '../../config/app-config';
import { dataSourceOptions } from '../data-source-options';
import { loadDemoScenario } from './load-demo-scenario';

/** `npm run seed -w api`: the demo accounts and scenario. Refuses to run in production. */
async function main(): Promise<void> {
  const config = loadConfig();
  if (config.nodeEnv === 'production') throw new Error('The demo scenario is never loaded in production.');
  const dataSource = new DataSource(dataSourceOptions(config.databaseUrl));
  await dataSource.initialize();
  try {
    const loaded = await loadDemoScenario(dataSource);
    console.log(`Demo scenario ready: ${loaded.staff} staff accounts, ${loaded.studies} studies.`);
  } finally {
    await dataSource.destroy();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
