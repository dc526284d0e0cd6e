import type { INestApplication } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { DocumentBuilder, OpenAPIObject, SwaggerModule } from '@nestjs/swagger';
import { contractOpenApiSchemas } from '@evenhand/contract/schemas';
import cookieParser from 'cookie-parser';
import type { Express } from 'express';
import { MediaTypeInterceptor, refuseForeignOrigins, refuseUnreadableInput } from './common/http/request-guards';
import { MAX_JSON_BYTES } from './common/http/request-hygiene';
import { createValidationPipe } from './common/http/validation';
import { AppConfig } from './config/app-config';

export const API_PREFIX = 'api';

/** Everything main.ts and the end-to-end tests both need, so tests run the app exactly as served. */
export function configureApp(app: INestApplication): OpenAPIObject {
  const config = app.get(AppConfig);
  const express = app.getHttpAdapter().getInstance() as Express;
  // X-Forwarded-For is believed only from configured proxies (none by default): otherwise any client could choose
  // the address its rate limits are counted under.
  express.set('trust proxy', config.trustProxy.length > 0 ? config.trustProxy : false);
  express.disable('x-powered-by');
  app.use(refuseForeignOrigins([config.portalUrl, config.adminUrl]));
  app.use(cookieParser());
  // Registered here, in this order, so the depth and text check runs on the parsed body before any class is built.
  (app as NestExpressApplication).useBodyParser('json', { limit: MAX_JSON_BYTES });
  app.use(refuseUnreadableInput());
  app.setGlobalPrefix(API_PREFIX);
  app.useGlobalInterceptors(new MediaTypeInterceptor(app.get(Reflector)));
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
  const document = SwaggerModule.createDocument(app, config);
  // Bodies whose shape depends on a field are the contract's zod schemas, published as they are.
  document.components = {
    ...document.components,
    schemas: {
      ...document.components?.schemas,
      ...(contractOpenApiSchemas() as NonNullable<OpenAPIObject['components']>['schemas']),
    },
  };
  return document;
}
