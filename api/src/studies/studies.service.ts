import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { SessionUser } from '../common/auth/session-user';
import { StudyListDto } from './dto/study.dto';
import { StudyMembershipEntity } from './entities/study-membership.entity';
import { StudyEntity } from './entities/study.entity';

@Injectable()
export class StudiesService {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  /** Admins see every study; other staff only those they are members of; participants those they take part in. */
  async listFor(user: SessionUser): Promise<StudyListDto> {
    const builder = this.dataSource.getRepository(StudyEntity).createQueryBuilder('study');
    if (user.role === 'participant') {
      // Participants take part through enrollments, which arrive with the consent work.
      return { items: [] };
    }
    if (user.role !== 'admin') {
      builder.innerJoin(StudyMembershipEntity, 'membership', 'membership.study_id = study.id AND membership.user_id = :userId', {
        userId: user.id,
      });
    }
    const studies = await builder.orderBy('study.created_at', 'DESC').getMany();
    return {
      items: studies.map(({ id, slug, title, status, design }) => ({ id, slug, title, status, design })),
    };
  }

  async isMember(userId: string, studyId: string): Promise<boolean> {
    return this.dataSource.getRepository(StudyMembershipEntity).exists({ where: { userId, studyId } });
  }
}
