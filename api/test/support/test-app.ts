import 'reflect-metadata';
import type { INestApplication } from '@nestjs/common';
import { Test } from '@nestjs/testing';
import request from 'supertest';
import { DataSource } from 'typeorm';
import { configureApp } from '../../src/app-setup';
import { AppModule } from '../../src/app.module';

export interface TestApp {
  app: INestApplication;
  dataSource: DataSource;
  /** A client that keeps cookies between calls, like one browser. */
  browser(): ReturnType<typeof request.agent>;
  close(): Promise<void>;
}

/** Boots the real application in-process against the test database; `env` overrides configuration for this app only. */
export async function startTestApp(overrides: Record<string, string> = {}): Promise<TestApp> {
  // Reminders are swept only when a test asks, so no reminder e-mail lands in another test's mailbox.
  const env = { REMINDER_SWEEP_CRON: '', AUDIT_RECEIPT_CRON: '', ...overrides };
  const saved: Record<string, string | undefined> = {};
  for (const [key, value] of Object.entries(env)) {
    saved[key] = process.env[key];
    process.env[key] = value;
  }
  try {
    const moduleRef = await Test.createTestingModule({ imports: [AppModule] }).compile();
    const app = moduleRef.createNestApplication({ logger: ['error', 'warn'], rawBody: true });
    configureApp(app);
    await app.init();
    return {
      app,
      dataSource: app.get(DataSource),
      browser: () => request.agent(app.getHttpServer()),
      close: () => app.close(),
    };
  } finally {
    for (const [key, value] of Object.entries(saved)) {
      if (value === undefined) delete process.env[key];
      else process.env[key] = value;
    }
  }
}
