import { startPaymentsFake, type RunningPaymentsFake } from './app/payments-fake-app';
import { ConfigError, readConfig } from './config/payments-fake-config';
import { StateFileError } from './state/state-file';

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
  let running: RunningPaymentsFake;
  try {
    running = await startPaymentsFake(config);
  } catch (error) {
    if (error instanceof StateFileError) {
      console.error(
        `payments-fake: cannot start: ${error.message}. Fix the file or move it away to start empty (PAYMENTS_FAKE_STATE_FILE).`,
      );
      process.exit(1);
    }
    throw error;
  }
  const state =
    running.stateFile === null
      ? 'state in memory only'
      : `state in ${running.stateFile}, ${running.restoredSavedAt ? `restored from the copy saved ${running.restoredSavedAt}` : 'starting empty'}`;
  console.log(
    `payments-fake listening on ${running.url} (webhooks ${config.webhookUrl ?? 'off'}, hosted pages ${config.publicUrl}, browser script ${running.url}/v1/stripe.js, ${state})`,
  );
  const stop = (signal: string) => {
    console.log(`payments-fake: ${signal}, shutting down`);
    running.close().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error('payments-fake: shutting down failed', error);
        process.exit(1);
      },
    );
  };
  process.once('SIGINT', () => stop('SIGINT'));
  process.once('SIGTERM', () => stop('SIGTERM'));
}

main().catch((error: unknown) => {
  console.error('payments-fake: failed to start', error);
  process.exit(1);
});
