import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { StepsModule } from '../steps';
import { StudiesModule } from '../studies';
import { ConsentController } from './consent.controller';
import { ConsentService } from './consent.service';

@Module({
  imports: [AuditModule, StudiesModule, StepsModule],
  controllers: [ConsentController],
  providers: [ConsentService],
  exports: [ConsentService],
})
export class ConsentModule {}
