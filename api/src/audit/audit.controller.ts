import { Body, Controller, Get, HttpCode, Param, Post, Query, Res } from '@nestjs/common';
import { ApiCreatedResponse, ApiOkResponse, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { uuidParam } from '../common/http/uuid-param';
import { AuditReceiptsService } from './audit-receipts.service';
import { AuditReport, AuditService } from './audit.service';
import { AuditTrailService } from './audit-trail.service';
import type { TrailEvent } from './audit-trail.read-model';
import {
  AuditEventDto,
  AuditFilterOptionsDto,
  AuditPageDto,
  AuditQueryDto,
  AuditReceiptDto,
  AuditReceiptListDto,
  AuditReportDto,
  AuditSelectionDto,
  VerifyAgainstReceiptDto,
} from './dto/audit.dto';

function selectionOf(query: AuditSelectionDto) {
  return {
    chain: query.chain,
    participant: query.participant,
    staff: query.staff,
    from: query.from,
    to: query.to,
    family: query.family,
    action: query.action,
  };
}

function eventDto(event: TrailEvent): AuditEventDto {
  const { studySlug: _slug, ...rest } = event;
  return { ...rest, at: event.at.toISOString() };
}

function download(response: Response, fileName: string, contentType: string): void {
  response.setHeader('Content-Type', contentType);
  response.setHeader('Content-Disposition', `attachment; filename="${fileName}"`);
  response.setHeader('Cache-Control', 'no-store');
}

@ApiTags('audit')
@Roles('auditor', 'admin')
@Controller('audit')
export class AuditController {
  constructor(
    private readonly audit: AuditService,
    private readonly receipts: AuditReceiptsService,
    private readonly trail: AuditTrailService,
  ) {}

  /** The trail in words, newest first, filtered by participant, staff member, dates and families of action. */
  @Get()
  @ApiOkResponse({ type: AuditPageDto })
  async list(@Query() query: AuditQueryDto): Promise<AuditPageDto> {
    const { items, total } = await this.trail.page(selectionOf(query), query.page, query.pageSize);
    return { items: items.map(eventDto), total, page: query.page, pageSize: query.pageSize };
  }

  /** What the filters can be set to: families of action, staff members, studies. */
  @Get('filters')
  @ApiOkResponse({ type: AuditFilterOptionsDto })
  filters(): Promise<AuditFilterOptionsDto> {
    return this.trail.filterOptions();
  }

  /** The selection as CSV, named by study and day. */
  @Get('export.csv')
  @ApiProduces('text/csv')
  @ApiOkResponse({ description: 'One row per event, newest first, with a byte-order mark', schema: { type: 'string' } })
  async exportCsv(@Query() query: AuditSelectionDto, @Res({ passthrough: true }) response: Response): Promise<string> {
    const file = await this.trail.exportCsv(selectionOf(query));
    download(response, file.fileName, 'text/csv; charset=utf-8');
    return file.body;
  }

  /** The verification summary of the same selection: the CSV's SHA-256, counts, and the chains' verdict against the latest receipt. */
  @Get('export-summary.txt')
  @ApiProduces('text/plain')
  @ApiOkResponse({ description: 'Plain text', schema: { type: 'string' } })
  async exportSummary(
    @CurrentUser() user: SessionUser,
    @Query() query: AuditSelectionDto,
    @Res({ passthrough: true }) response: Response,
  ): Promise<string> {
    const file = await this.trail.exportSummary(user, selectionOf(query));
    download(response, file.fileName, 'text/plain; charset=utf-8');
    return file.body;
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
  @ApiOkResponse({ type: AuditReceiptDto })
  async getReceipt(
    @Param('receiptId', uuidParam('receiptId')) receiptId: string,
    @Res({ passthrough: true }) response: Response,
  ): Promise<AuditReceiptDto> {
    const receipt = await this.receipts.get(receiptId);
    response.setHeader('Content-Disposition', `attachment; filename="audit-receipt-${receipt.number}.json"`);
    return receipt;
  }

  private async toDto(report: AuditReport): Promise<AuditReportDto> {
    return { ...report, findings: await this.trail.describeFindings(report), checkedAt: new Date().toISOString() };
  }
}
