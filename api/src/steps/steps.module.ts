import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { StudiesModule } from '../studies';
import { StepsController } from './steps.controller';
import { StepsService } from './steps.service';

@Module({
  imports: [AuditModule, StudiesModule],
  controllers: [StepsController],
  providers: [StepsService],
  exports: [StepsService],
})
export class StepsModule {}
