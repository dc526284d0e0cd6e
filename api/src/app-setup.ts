import type { INestApplication } from '@nestjs/common';
import { DocumentBuilder, OpenAPIObject, SwaggerModule } from '@nestjs/swagger';
import cookieParser from 'cookie-parser';
import type { Express } from 'express';
import { createValidationPipe } from './common/http/validation';

export const API_PREFIX = 'api';

/** Everything main.ts and the end-to-end tests both need, so tests run the app exactly as served. */
export function configureApp(app: INestApplication): OpenAPIObject {
  const express = app.getHttpAdapter().getInstance() as Express;
  // Behind one proxy hop at most (the front ends' dev servers), so request.ip is the client's.
  express.set('trust proxy', 'loopback');
  express.disable('x-powered-by');
  app.use(cookieParser());
  app.setGlobalPrefix(API_PREFIX);
  app.useGlobalPipes(createValidationPipe());
  app.enableShutdownHooks();
  const document = buildOpenApiDocument(app);
  SwaggerModule.setup(`${API_PREFIX}/docs`, app, document, {
    jsonDocumentUrl: `${API_PREFIX}/openapi.json`,
    customSiteTitle: 'Evenhand API',
  });
  return document;
}

export function buildOpenApiDocument(app: INestApplication): OpenAPIObject {
  const config = new DocumentBuilder()
    .setTitle('Evenhand API')
    .setDescription('Consent, assignment, pay and dropout watch for paid studies with human participants.')
    .setVersion('0.1.0')
    .addCookieAuth('eh_access')
    .build();
  return SwaggerModule.createDocument(app, config);
}
