import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { RandomizationService } from './randomization.service';

/** The assignment engine: sealing, allocating, verifying. Knows nothing of studies beyond the snapshots it is given. */
@Module({ imports: [AuditModule], providers: [RandomizationService], exports: [RandomizationService] })
export class RandomizationModule {}
