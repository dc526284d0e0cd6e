import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';

/**
 * The stratification answers of a study's screened people (eligible and beyond, not the excluded), for the
 * assignment page's dry run to start from the mix the study actually recruits.
 */
@Injectable()
export class ScreenedCovariatesReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async of(studyId: string): Promise<Array<Record<string, number | string | null>>> {
    const rows: Array<{ covariates: Record<string, number | string | null> }> = await this.dataSource.query(
      `SELECT covariates FROM enrollment
       WHERE study_id = $1 AND status NOT IN ('invited', 'excluded') AND covariates <> '{}'::jsonb`,
      [studyId],
    );
    return rows.map((row) => row.covariates);
  }
}
