import { Body, Controller, Get, Headers, HttpCode, Param, Post, Query, Req, Res } from '@nestjs/common';
import { ApiCreatedResponse, ApiOkResponse, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { RawBodyRequest } from '@nestjs/common';
import type { Request, Response } from 'express';
import { CurrentUser, Public, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { uuidParam } from '../common/http/uuid-param';
import { StudyMembersOnly } from '../studies';
import {
  ApprovalResultDto,
  ApprovePayoutsDto,
  BudgetDto,
  CreateFundingDto,
  FinanceExportQueryDto,
  FundingIntentDto,
  MyPayoutsDto,
  OnboardingLinkDto,
  PayoutAccountStatusDto,
  PayoutPageDto,
  PayoutQueryDto,
  ReconciliationDto,
  TaxThresholdDto,
} from './dto/payout.dto';
import { FundingService } from './funding.service';
import { PayoutAccountsService } from './payout-accounts.service';
import { PayoutApprovalService } from './payout-approval.service';
import { PayoutQueueService } from './payout-queue.service';
import { PayoutReportsService } from './payout-reports.service';
import { ProviderWebhooksService } from './provider-webhooks.service';

/** The payout queue, budget and reconciliation, for a study's staff. */
@ApiTags('pay')
@Controller('studies/:studyId')
@StudyMembersOnly()
export class StudyPayoutsController {
  constructor(
    private readonly queue: PayoutQueueService,
    private readonly approval: PayoutApprovalService,
    private readonly reports: PayoutReportsService,
    private readonly funding: FundingService,
  ) {}

  @Get('payouts')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: PayoutPageDto })
  list(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Query() query: PayoutQueryDto,
  ): Promise<PayoutPageDto> {
    return this.queue.list(studyId, query);
  }

  @Post('payouts/approve')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: ApprovalResultDto })
  approve(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: ApprovePayoutsDto,
  ): Promise<ApprovalResultDto> {
    return this.approval.approve(user, studyId, body.payoutIds);
  }

  @Get('payouts/reconciliation')
  @Roles('coordinator', 'auditor', 'admin')
  @ApiOkResponse({ type: ReconciliationDto })
  reconciliation(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<ReconciliationDto> {
    return this.queue.reconciliation(studyId);
  }

  @Get('payouts/finance-export.csv')
  @Roles('coordinator', 'auditor', 'admin')
  @ApiProduces('text/csv')
  @ApiOkResponse({
    description:
      "Per participant: paid in the period, paid in the year across studies, the tax-reporting threshold (UTF-8 with a byte-order mark). Pay and tax rules defer to the institution's finance office.",
    schema: { type: 'string' },
  })
  async financeExport(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Query() query: FinanceExportQueryDto,
    @Res() response: Response,
  ): Promise<void> {
    const { fileName, csv } = await this.reports.financeExport(studyId, query);
    response
      .status(200)
      .type('text/csv; charset=utf-8')
      .setHeader('Content-Disposition', `attachment; filename="${fileName}"`)
      .setHeader('Cache-Control', 'no-store')
      .send(csv);
  }

  @Get('payouts/tax-threshold')
  @Roles('coordinator', 'auditor', 'admin')
  @ApiOkResponse({ type: TaxThresholdDto })
  taxThreshold(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<TaxThresholdDto> {
    return this.reports.taxThreshold(studyId);
  }

  @Get('budget')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: BudgetDto })
  budget(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<BudgetDto> {
    return this.funding.budget(studyId);
  }

  @Post('funding')
  @Roles('coordinator', 'admin')
  @ApiCreatedResponse({ type: FundingIntentDto })
  fund(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: CreateFundingDto,
  ): Promise<FundingIntentDto> {
    return this.funding.createFunding(user, studyId, body.amountMinor);
  }

  @Post('funding/:fundingId/refresh')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: BudgetDto })
  refreshFunding(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('fundingId', uuidParam('fundingId')) fundingId: string,
  ): Promise<BudgetDto> {
    return this.funding.refreshFunding(studyId, fundingId);
  }
}

@ApiTags('pay')
@Controller()
export class PayoutsController {
  constructor(
    private readonly approval: PayoutApprovalService,
    private readonly accounts: PayoutAccountsService,
    private readonly webhooks: ProviderWebhooksService,
  ) {}

  @Post('payouts/:payoutId/retry')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ description: 'Queued again' })
  async retry(
    @CurrentUser() user: SessionUser,
    @Param('payoutId', uuidParam('payoutId')) payoutId: string,
  ): Promise<{ queued: boolean }> {
    await this.approval.retry(user, payoutId);
    return { queued: true };
  }

  @Post('me/payout-account')
  @HttpCode(200)
  @Roles('participant')
  @ApiOkResponse({ type: OnboardingLinkDto })
  onboard(@CurrentUser() user: SessionUser): Promise<OnboardingLinkDto> {
    return this.accounts.startOnboarding(user);
  }

  @Get('me/payout-account')
  @Roles('participant')
  @ApiOkResponse({ type: PayoutAccountStatusDto })
  account(@CurrentUser() user: SessionUser): Promise<PayoutAccountStatusDto> {
    return this.accounts.accountStatus(user);
  }

  @Get('me/payouts')
  @Roles('participant')
  @ApiOkResponse({ type: MyPayoutsDto })
  mine(@CurrentUser() user: SessionUser): Promise<MyPayoutsDto> {
    return this.accounts.myPayouts(user);
  }

  /** The provider's signed events. The raw body is kept because the signature covers its exact bytes. */
  @Public()
  @Post('webhooks/payments')
  @HttpCode(200)
  @ApiOkResponse({ description: 'Received (also for a duplicate, which changes nothing)' })
  webhook(@Req() request: RawBodyRequest<Request>, @Headers('stripe-signature') signature: string | undefined) {
    return this.webhooks.handleWebhook(request.rawBody, signature);
  }
}
