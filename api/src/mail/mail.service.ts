import { Injectable, Logger, OnApplicationShutdown, OnModuleInit } from '@nestjs/common';
import * as nodemailer from 'nodemailer';
import type { EntityManager } from 'typeorm';
import { AppConfig } from '../config/app-config';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: Array<{ filename: string; content: Buffer; contentType: string }>;
}

/** E-mail goes out through a job, so a slow or failing mail server never fails the request that caused it. */
@Injectable()
export class MailService implements OnModuleInit, OnApplicationShutdown {
  private readonly logger = new Logger('Mail');
  private readonly transport: nodemailer.Transporter;

  constructor(
    private readonly config: AppConfig,
    private readonly jobs: JobQueueService,
  ) {
    this.transport = nodemailer.createTransport({
      host: config.smtpHost,
      port: config.smtpPort,
      secure: false,
      ignoreTLS: config.nodeEnv !== 'production',
      // Reuses a few open connections: receipts for a large batch would otherwise each open their own.
      pool: true,
      maxConnections: 3,
    });
  }

  async onModuleInit(): Promise<void> {
    await this.jobs.handle<OutgoingMail>(JOB_NAMES.sendMail, (mail) => this.deliver(mail));
  }

  onApplicationShutdown(): void {
    this.transport.close();
  }

  /** Queues a message in the caller's transaction. */
  enqueue(manager: EntityManager, mail: OutgoingMail): Promise<void> {
    return this.jobs.enqueue(manager, JOB_NAMES.sendMail, mail);
  }

  async deliver(mail: OutgoingMail): Promise<void> {
    await this.transport.sendMail({ from: this.config.mailFrom, ...mail });
    this.logger.log(`Sent "${mail.subject}" to ${mail.to}`);
  }
}
