import { startPaymentsFake } from './app/payments-fake-app';
import { ConfigError, readConfig } from './config/payments-fake-config';

async function main(): Promise<void> {
  let config;
  try {
    config = readConfig(process.env);
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(`payments-fake: bad configuration: ${error.message}`);
      process.exit(1);
    }
    throw error;
  }
  const running = await startPaymentsFake(config);
  console.log(
    `payments-fake listening on ${running.url} (webhooks ${config.webhookUrl ?? 'off'}, hosted pages ${config.publicUrl}, browser script ${running.url}/v1/stripe.js)`,
  );
  const stop = (signal: string) => {
    console.log(`payments-fake: ${signal}, shutting down`);
    running.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.once('SIGINT', () => stop('SIGINT'));
  process.once('SIGTERM', () => stop('SIGTERM'));
}

main().catch((error: unknown) => {
  console.error('payments-fake: failed to start', error);
  process.exit(1);
});
