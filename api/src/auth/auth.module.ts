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
      useFactory: (config: AppConfig) => ({ secret: config.jwtSecret, signOptions: { algorithm: 'HS256' } }),
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
