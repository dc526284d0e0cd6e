import { Module } from '@nestjs/common';
import { ThrottlerModule } from '@nestjs/throttler';
import { getDataSourceToken } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AppConfig } from '../config/app-config';
import { PostgresThrottlerStorage } from './postgres-throttler.storage';

export const SIGN_IN_THROTTLER = 'sign-in';

@Module({
  imports: [
    ThrottlerModule.forRootAsync({
      inject: [AppConfig, getDataSourceToken()],
      useFactory: (config: AppConfig, dataSource: DataSource) => ({
        throttlers: [{ name: SIGN_IN_THROTTLER, ttl: config.signInWindowSeconds * 1000, limit: config.signInLimit }],
        storage: new PostgresThrottlerStorage(dataSource),
      }),
    }),
  ],
  exports: [ThrottlerModule],
})
export class RateLimitModule {}
