import { Body, Controller, Get, Header, HttpCode, Param, Post, Query } from '@nestjs/common';
import { ApiCreatedResponse, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { uuidParam } from '../common/http/uuid-param';
import { AuditReceiptsService } from './audit-receipts.service';
import { AuditReport, AuditService } from './audit.service';
import { AuditPageDto, AuditQueryDto, AuditReceiptDto, AuditReceiptListDto, AuditReportDto, VerifyAgainstReceiptDto } from './dto/audit.dto';

@ApiTags('audit')
@Roles('auditor', 'admin')
@Controller('audit')
export class AuditController {
  constructor(
    private readonly audit: AuditService,
    private readonly receipts: AuditReceiptsService,
  ) {}

  @Get()
  @ApiOkResponse({ type: AuditPageDto })
  async list(@Query() query: AuditQueryDto): Promise<AuditPageDto> {
    const { items, total } = await this.audit.page({
      chains: query.chain ? [query.chain] : 'all',
      action: query.action,
      page: query.page,
      pageSize: query.pageSize,
    });
    return {
      items: items.map((event) => ({ ...event, at: event.at.toISOString() })),
      total,
      page: query.page,
      pageSize: query.pageSize,
    };
  }

  /** Every chain from its first event, then against the latest audit receipt. */
  @Get('verify')
  @ApiOkResponse({ type: AuditReportDto })
  async verify(): Promise<AuditReportDto> {
    return this.toDto(await this.audit.report());
  }

  /** Every chain against a receipt an auditor kept (e-mailed or downloaded earlier). */
  @Post('verify')
  @HttpCode(200)
  @ApiOkResponse({ type: AuditReportDto })
  async verifyAgainst(@Body() body: VerifyAgainstReceiptDto): Promise<AuditReportDto> {
    return this.toDto(await this.audit.report({ receipt: body.receipt }));
  }

  @Post('receipts')
  @ApiCreatedResponse({ type: AuditReceiptDto })
  async issueReceipt(@CurrentUser() user: SessionUser): Promise<AuditReceiptDto> {
    return (await this.receipts.issue('on-demand', user))!;
  }

  @Get('receipts')
  @ApiOkResponse({ type: AuditReceiptListDto })
  async listReceipts(): Promise<AuditReceiptListDto> {
    return { items: await this.receipts.list() };
  }

  @Get('receipts/:receiptId')
  @Header('Content-Disposition', 'attachment; filename="audit-receipt.json"')
  @ApiOkResponse({ type: AuditReceiptDto })
  getReceipt(@Param('receiptId', uuidParam('receiptId')) receiptId: string): Promise<AuditReceiptDto> {
    return this.receipts.get(receiptId);
  }

  private toDto(report: AuditReport): AuditReportDto {
    return { ...report, checkedAt: new Date().toISOString() };
  }
}
