import { Controller, Get, Param } from '@nestjs/common';
import { ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { Public } from '../common/auth/auth.decorators';
import { StudyException } from './study.exception';
import { StepsService } from '../steps';
import { PublicStudyDto } from './dto/screening.dto';
import { StudiesService } from './studies.service';

/** What a prospective participant may see before signing in: never conditions, schemes or anyone's data. */
@ApiTags('public')
@Controller('public/studies')
export class PublicStudyController {
  constructor(
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
  ) {}

  @Public()
  @Get(':slug')
  @ApiOkResponse({ type: PublicStudyDto })
  async get(@Param('slug') slug: string): Promise<PublicStudyDto> {
    const study = /^[a-z0-9-]{1,80}$/.test(slug) ? await this.studies.findBySlug(slug) : null;
    if (!study || study.status === 'draft')
      throw new StudyException('NOT_FOUND', 'There is no open study at this link.');
    const steps = await this.steps.list(study.id);
    const { eligibility } = await this.studies.screeningDefinition(study.id);
    return {
      id: study.id,
      slug: study.slug,
      title: study.title,
      summary: study.summary,
      estimatedMinutes: study.estimatedMinutes,
      status: study.status,
      protocolNumber: study.protocolNumber,
      labName: study.labName,
      contactEmail: study.contactEmail,
      currency: study.currency,
      totalPayMinor: steps.totalPayMinor,
      steps: steps.items.map(({ position, title, description, payMinor }) => ({
        position,
        title,
        description,
        payMinor,
      })),
      eligibility: eligibility.map((q) => ({ key: q.key, label: q.criterion ?? q.label })),
    };
  }
}
