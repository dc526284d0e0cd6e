import { Controller, Get, Query } from '@nestjs/common';
import { ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { Roles } from '../common/auth/auth.decorators';
import { AuditService } from './audit.service';
import { AuditPageDto, AuditQueryDto, AuditVerificationDto } from './dto/audit.dto';

@ApiTags('audit')
@Roles('auditor', 'admin')
@Controller('audit')
export class AuditController {
  constructor(private readonly audit: AuditService) {}

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

  @Get('verify')
  @ApiOkResponse({ type: AuditVerificationDto })
  async verify(): Promise<AuditVerificationDto> {
    const chains = await this.audit.verify();
    return { intact: chains.every((chain) => chain.intact), checkedAt: new Date().toISOString(), chains };
  }
}
