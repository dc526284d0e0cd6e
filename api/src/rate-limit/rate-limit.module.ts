import { ExecutionContext, Module } from '@nestjs/common';
import { ThrottlerModule } from '@nestjs/throttler';
import { getDataSourceToken } from '@nestjs/typeorm';
import type { Request } from 'express';
import { DataSource } from 'typeorm';
import { AppConfig } from '../config/app-config';
import { PostgresThrottlerStorage } from './postgres-throttler.storage';
import { SIGN_IN_CLIENT_THROTTLER, SIGN_IN_EMAIL_THROTTLER, signInEmailOf } from './sign-in-throttler.guard';

@Module({
  imports: [
    ThrottlerModule.forRootAsync({
      inject: [AppConfig, getDataSourceToken()],
      useFactory: (config: AppConfig, dataSource: DataSource) => ({
        throttlers: [
          { name: SIGN_IN_CLIENT_THROTTLER, ttl: config.signInWindowSeconds * 1000, limit: config.signInClientLimit },
          {
            name: SIGN_IN_EMAIL_THROTTLER,
            ttl: config.signInWindowSeconds * 1000,
            limit: config.signInLimit,
            // A request naming no address is refused by validation; only the client count applies to it.
            skipIf: (context: ExecutionContext) => signInEmailOf(context.switchToHttp().getRequest<Request>()) === '',
          },
        ],
        storage: new PostgresThrottlerStorage(dataSource),
      }),
    }),
  ],
  exports: [ThrottlerModule],
})
export class RateLimitModule {}
