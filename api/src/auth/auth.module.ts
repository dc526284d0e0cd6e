import { createSecretKey } from 'node:crypto';
import { Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { JwtModule } from '@nestjs/jwt';
import { AuditModule } from '../audit';
import { SessionGuard } from './session.guard';
import { AppConfig } from '../config/app-config';
import { MailModule } from '../mail/mail.module';
import { RateLimitModule } from '../rate-limit/rate-limit.module';
import { UsersModule } from '../users';
import { AuthController } from './auth.controller';
import { AuthService } from './auth.service';
import { TwoFactorController } from './two-factor.controller';
import { TwoFactorService } from './two-factor.service';

@Module({
  imports: [
    JwtModule.registerAsync({
      global: true,
      inject: [AppConfig],
      useFactory: (config: AppConfig) => ({
        // One key object for every token: handed a string, jsonwebtoken first tries to read it as a PEM public or
        // private key on every call and only then falls back to a secret key, a cost measured on each request.
        secret: createSecretKey(Buffer.from(config.jwtSecret, 'utf8')),
        signOptions: { algorithm: 'HS256' },
        verifyOptions: { algorithms: ['HS256'] },
      }),
    }),
    UsersModule,
    AuditModule,
    MailModule,
    RateLimitModule,
  ],
  controllers: [AuthController, TwoFactorController],
  providers: [AuthService, TwoFactorService, { provide: APP_GUARD, useClass: SessionGuard }],
})
export class AuthModule {}
