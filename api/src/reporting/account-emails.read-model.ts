import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';

/** The e-mail of each account that recorded or undid something, for a participant's record. */
@Injectable()
export class AccountEmailsReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async of(userIds: string[]): Promise<Map<string, string>> {
    if (userIds.length === 0) return new Map();
    const rows: Array<{ id: string; email: string }> = await this.dataSource.query(
      `SELECT id, email FROM user_account WHERE id = ANY($1::uuid[])`,
      [userIds],
    );
    return new Map(rows.map((r) => [r.id, r.email]));
  }
}
