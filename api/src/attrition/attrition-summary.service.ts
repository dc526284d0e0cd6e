import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AppConfig } from '../config/app-config';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';

/**
 * Keeps the dropout watch's summary small: the triggers only ever add delta rows, and this job folds them into the
 * compacted rows now and then (`attrition_compact()`, one at a time under an advisory lock). The report is exact
 * whether or not it has run; compaction only keeps the number of rows it sums down.
 */
@Injectable()
export class AttritionSummaryService implements OnModuleInit {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly jobs: JobQueueService,
    private readonly config: AppConfig,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle(JOB_NAMES.compactAttritionSummary, () => this.compact());
    if (this.config.attritionCompactCron)
      await this.jobs.schedule(JOB_NAMES.compactAttritionSummary, this.config.attritionCompactCron);
    else await this.jobs.unschedule(JOB_NAMES.compactAttritionSummary);
  }

  /** Folds every committed delta row into the compacted summary, in one transaction. */
  async compact(): Promise<void> {
    await this.dataSource.transaction((manager) => manager.query(`SELECT attrition_compact()`));
  }
}
