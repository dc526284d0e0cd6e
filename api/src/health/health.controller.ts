import { Controller, Get, Res } from '@nestjs/common';
import { ApiOkResponse, ApiProperty, ApiServiceUnavailableResponse, ApiTags } from '@nestjs/swagger';
import { InjectDataSource } from '@nestjs/typeorm';
import type { Response } from 'express';
import { DataSource } from 'typeorm';
import { Public } from '../common/auth/auth.decorators';
import { JobQueueService } from '../jobs/job-queue.service';
import { PaymentsService } from '../payments/payments.service';

type PartState = 'up' | 'down';

export class HealthDto {
  @ApiProperty({ enum: ['ok', 'degraded'] }) status: 'ok' | 'degraded';
  @ApiProperty({ enum: ['up', 'down'] }) database: PartState;
  @ApiProperty({ enum: ['up', 'down'] }) queue: PartState;
  @ApiProperty({ enum: ['up', 'down'] }) payments: PartState;
}

@ApiTags('health')
@Controller('health')
export class HealthController {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly jobs: JobQueueService,
    private readonly payments: PaymentsService,
  ) {}

  /** 200 when the database and the job queue answer; the payments provider is reported but does not fail it. */
  @Public()
  @Get()
  @ApiOkResponse({ type: HealthDto })
  @ApiServiceUnavailableResponse({ type: HealthDto })
  async check(@Res({ passthrough: true }) response: Response): Promise<HealthDto> {
    const [database, queue, payments] = await Promise.all([
      this.dataSource.query('SELECT 1').then(
        () => 'up' as const,
        () => 'down' as const,
      ),
      this.jobs.isReachable().then((up) => (up ? 'up' : 'down') as PartState),
      this.payments.isReachable().then((up) => (up ? 'up' : 'down') as PartState),
    ]);
    const healthy = database === 'up' && queue === 'up';
    if (!healthy) response.status(503);
    return { status: healthy ? 'ok' : 'degraded', database, queue, payments };
  }
}
