import { CanActivate, ExecutionContext, Injectable, UseGuards, applyDecorators } from '@nestjs/common';
import type { Request } from 'express';
import type { SessionUser } from '../common/auth/session-user';
import { StudyException } from './study.exception';
import { StudiesService } from './studies.service';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** For routes under /studies/:studyId: only members of that study (and admins and auditors) get through. */
@Injectable()
export class StudyAccessGuard implements CanActivate {
  constructor(private readonly studies: StudiesService) {}

  async canActivate(context: ExecutionContext): Promise<boolean> {
    const request = context.switchToHttp().getRequest<Request & { user?: SessionUser }>();
    const studyId = request.params.studyId;
    const user = request.user;
    if (!user) throw new StudyException('UNAUTHENTICATED', 'Please sign in.');
    if (typeof studyId !== 'string' || !UUID.test(studyId)) {
      throw new StudyException('VALIDATION_FAILED', 'studyId must be a UUID.', [
        { field: 'studyId', message: 'must be a UUID' },
      ]);
    }
    // Admins manage every study; auditors read every study (their role allows no writes).
    if (user.role === 'admin' || user.role === 'auditor') return true;
    // Not found rather than forbidden, so outsiders cannot tell which studies exist.
    if (!(await this.studies.isMember(user.id, studyId))) throw new StudyException('NOT_FOUND', 'No such study.');
    return true;
  }
}

export const StudyMembersOnly = () => applyDecorators(UseGuards(StudyAccessGuard));
