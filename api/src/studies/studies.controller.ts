import { Controller, Get } from '@nestjs/common';
import { ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { CurrentUser } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { StudyListDto } from './dto/study.dto';
import { StudiesService } from './studies.service';

@ApiTags('studies')
@Controller('studies')
export class StudiesController {
  constructor(private readonly studies: StudiesService) {}

  @Get()
  @ApiOkResponse({ type: StudyListDto })
  list(@CurrentUser() user: SessionUser): Promise<StudyListDto> {
    return this.studies.listFor(user);
  }
}
