import { Body, Controller, Get, HttpCode, Post, Req, Res, UseGuards } from '@nestjs/common';
import {
  ApiAcceptedResponse,
  ApiNoContentResponse,
  ApiOkResponse,
  ApiTags,
  ApiTooManyRequestsResponse,
  ApiUnauthorizedResponse,
} from '@nestjs/swagger';
import type { CookieOptions, Request, Response } from 'express';
import { AllowedBeforeTwoFactorSetup, CurrentUser, Public, Roles } from '../common/auth/auth.decorators';
import { ACCESS_COOKIE, REFRESH_COOKIE, SessionUser } from '../common/auth/session-user';
import { AppConfig } from '../config/app-config';
import { SignInThrottlerGuard } from '../rate-limit/sign-in-throttler.guard';
import { UsersService } from '../users';
import { AuthService, ClientInfo, IssuedSession, toMeDto } from './auth.service';
import {
  ChangePasswordDto,
  ConsumePasswordResetDto,
  RequestPasswordResetDto,
  ConsumeSignInLinkDto,
  LinkRequestedDto,
  MeDto,
  RequestSignInLinkDto,
  SessionDto,
  SignInDto,
} from './dto/auth.dto';

const REFRESH_COOKIE_PATH = '/api/auth';

function clientOf(request: Request): ClientInfo {
  return { ip: request.ip ?? null, userAgent: request.get('user-agent')?.slice(0, 400) ?? null };
}

@ApiTags('auth')
@Controller('auth')
export class AuthController {
  constructor(
    private readonly auth: AuthService,
    private readonly users: UsersService,
    private readonly config: AppConfig,
  ) {}

  @Public()
  @UseGuards(SignInThrottlerGuard)
  @Post('sign-in')
  @HttpCode(200)
  @ApiOkResponse({ type: SessionDto })
  @ApiTooManyRequestsResponse({ description: 'Too many attempts' })
  @ApiUnauthorizedResponse({
    description: 'INVALID_CREDENTIALS; TWO_FACTOR_REQUIRED (send again with code or recoveryCode); TWO_FACTOR_INVALID',
  })
  async signIn(
    @Body() body: SignInDto,
    @Req() request: Request,
    @Res({ passthrough: true }) response: Response,
  ): Promise<SessionDto> {
    return this.withCookies(
      response,
      await this.auth.signInWithPassword(
        body.email,
        body.password,
        { code: body.code, recoveryCode: body.recoveryCode },
        clientOf(request),
      ),
    );
  }

  @Public()
  @UseGuards(SignInThrottlerGuard)
  @Post('sign-in-link')
  @HttpCode(202)
  @ApiAcceptedResponse({ type: LinkRequestedDto })
  async requestLink(@Body() body: RequestSignInLinkDto): Promise<LinkRequestedDto> {
    await this.auth.requestSignInLink(body.email, body.studySlug);
    return { sent: true };
  }

  // Not rate limited: the token carries 256 random bits, and a limit per address would lock out a lab's shared network.
  @Public()
  @Post('sign-in-link/consume')
  @HttpCode(200)
  @ApiOkResponse({ type: SessionDto })
  async consumeLink(
    @Body() body: ConsumeSignInLinkDto,
    @Req() request: Request,
    @Res({ passthrough: true }) response: Response,
  ): Promise<SessionDto> {
    return this.withCookies(response, await this.auth.consumeSignInLink(body.token, clientOf(request)));
  }

  @Public()
  @Post('refresh')
  @HttpCode(200)
  @ApiOkResponse({ type: SessionDto })
  async refresh(@Req() request: Request, @Res({ passthrough: true }) response: Response): Promise<SessionDto> {
    try {
      return this.withCookies(response, await this.auth.refresh(request.cookies?.[REFRESH_COOKIE]));
    } catch (error) {
      this.clearCookies(response);
      throw error;
    }
  }

  @Public()
  @Post('sign-out')
  @HttpCode(204)
  @ApiNoContentResponse()
  async signOut(@Req() request: Request, @Res({ passthrough: true }) response: Response): Promise<void> {
    await this.auth.signOut(request.cookies?.[REFRESH_COOKIE], clientOf(request));
    this.clearCookies(response);
  }

  @Post('password')
  @AllowedBeforeTwoFactorSetup()
  @HttpCode(204)
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiNoContentResponse({ description: 'The signed-in staff member’s password is changed; this session carries on' })
  async changePassword(@CurrentUser() user: SessionUser, @Body() body: ChangePasswordDto): Promise<void> {
    await this.users.changeOwnPassword(user, body.currentPassword, body.newPassword);
  }

  @Public()
  @UseGuards(SignInThrottlerGuard)
  @Post('password-reset')
  @HttpCode(202)
  @ApiAcceptedResponse({
    type: LinkRequestedDto,
    description: 'The same answer whether or not the address has an account',
  })
  async requestPasswordReset(@Body() body: RequestPasswordResetDto): Promise<LinkRequestedDto> {
    await this.auth.requestPasswordReset(body.email);
    return { sent: true };
  }

  // Not rate limited, like sign-in links: the token carries 256 bits.
  @Public()
  @Post('password-reset/consume')
  @HttpCode(204)
  @ApiNoContentResponse({ description: 'The new password is set and every session of the person has ended' })
  async consumePasswordReset(@Body() body: ConsumePasswordResetDto, @Req() request: Request): Promise<void> {
    await this.auth.consumePasswordReset(body.token, body.newPassword, clientOf(request));
  }

  @Get('me')
  @AllowedBeforeTwoFactorSetup()
  @ApiOkResponse({ type: MeDto })
  async me(@CurrentUser() user: SessionUser): Promise<MeDto> {
    const current = await this.users.findActiveById(user.id);
    return toMeDto(current!, user.twoFactorSetupNeeded ?? false);
  }

  private cookieOptions(path: string, maxAgeSeconds: number): CookieOptions {
    return { httpOnly: true, sameSite: 'lax', secure: this.config.secureCookies, path, maxAge: maxAgeSeconds * 1000 };
  }

  private withCookies(response: Response, session: IssuedSession): SessionDto {
    response.cookie(ACCESS_COOKIE, session.accessToken, this.cookieOptions('/', this.config.accessTokenSeconds));
    response.cookie(
      REFRESH_COOKIE,
      session.refreshToken,
      this.cookieOptions(REFRESH_COOKIE_PATH, this.config.refreshTokenSeconds),
    );
    return { user: session.user, studySlug: session.studySlug ?? null };
  }

  private clearCookies(response: Response): void {
    response.clearCookie(ACCESS_COOKIE, { path: '/' });
    response.clearCookie(REFRESH_COOKIE, { path: REFRESH_COOKIE_PATH });
  }
}
