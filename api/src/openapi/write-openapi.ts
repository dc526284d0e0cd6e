import 'reflect-metadata';
import { NestFactory } from '@nestjs/core';
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { API_PREFIX, buildOpenApiDocument } from '../app-setup';
import { AppModule } from '../app.module';

/**
 * `npm run openapi -w api`: writes api/openapi.json, from which the contract (api/contract) generates the typed client
 * both apps use. `node dist/openapi/write-openapi.js <file>` writes elsewhere (the suite compares the two).
 * Preview mode builds the module graph without connecting to anything.
 */
async function main(): Promise<void> {
  const app = await NestFactory.create(AppModule, { preview: true, logger: false });
  app.setGlobalPrefix(API_PREFIX);
  const document = buildOpenApiDocument(app);
  const target = process.argv[2] ? resolve(process.argv[2]) : resolve(__dirname, '../../openapi.json');
  writeFileSync(target, `${JSON.stringify(document, null, 2)}\n`);
  console.log(`Wrote ${target}`);
  await app.close();
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
