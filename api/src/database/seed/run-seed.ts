import 'reflect-metadata';
import { NestFactory } from '@nestjs/core';
import { DataSource } from 'typeorm';
import { AppModule } from '../../app.module';
import { loadConfig } from '../../config/app-config';
import { buildDemoStudies } from './build-demo-studies';
import { loadDemoAccounts } from './load-demo-accounts';
import { warnIfProviderForgotDemoPayouts } from './play-demo-payouts';

/** `npm run seed -w api`: the demo accounts and scenario. Refuses to run in production. */
async function main(): Promise<void> {
  const config = loadConfig();
  if (config.nodeEnv === 'production') throw new Error('The demo scenario is never loaded in production.');
  // This process only writes; the running api picks up the jobs it queues (signed copies, e-mail).
  process.env.RUN_WORKERS = 'false';
  const app = await NestFactory.createApplicationContext(AppModule, { logger: ['error', 'warn'] });
  try {
    const staff = await loadDemoAccounts(app.get(DataSource));
    const built = await buildDemoStudies(app);
    const warning = built.length ? null : await warnIfProviderForgotDemoPayouts(app);
    if (warning) console.warn(`Warning: ${warning}`);
    console.log(
      `Demo scenario ready: ${staff} staff accounts; ${built.length ? `built ${built.join(', ')}` : 'studies already present'}.`,
    );
  } finally {
    await app.close();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
