import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { configureApp } from './app-setup';
import { AppModule } from './app.module';
import { AppConfig } from './config/app-config';

async function bootstrap(): Promise<void> {
  const app = await NestFactory.create(AppModule, { bufferLogs: false, rawBody: true });
  configureApp(app);
  const config = app.get(AppConfig);
  await app.listen(config.port, config.host);
  new Logger('Evenhand').log(`api listening on http://${config.host}:${config.port}/api (docs at /api/docs)`);
}

bootstrap().catch((error) => {
  console.error(error);
  process.exit(1);
});
