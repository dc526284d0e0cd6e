import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';

/** Who a signed copy is for: the enrollment's study and reference (to label it) and the signer's e-mail. */
export interface SignedCopyRecipient {
  studyId: string;
  reference: string;
  email: string;
}

/** Addresses and labels a signed copy of a consent form (enrollment joined to the signer's account). */
@Injectable()
export class SignedCopyRecipientsReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async of(enrollmentId: string): Promise<SignedCopyRecipient | null> {
    const [row] = await this.dataSource.query(
      `SELECT e.study_id, e.reference, u.email FROM enrollment e JOIN user_account u ON u.id = e.participant_id WHERE e.id = $1`,
      [enrollmentId],
    );
    return row ? { studyId: row.study_id, reference: row.reference, email: row.email } : null;
  }
}
