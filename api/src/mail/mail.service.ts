import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
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
export class MailService implements OnModuleInit {
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
    });
  }

  async onModuleInit(): Promise<void> {
    await this.jobs.handle<OutgoingMail>(JOB_NAMES.sendMail, (mail) => this.deliver(mail));
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
