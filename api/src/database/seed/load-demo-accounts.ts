import * as bcrypt from 'bcryptjs';
import type { DataSource } from 'typeorm';
import { DEMO_PASSWORD, DEMO_STAFF } from './demo-scenario';

/** The demo staff accounts (outside production only); running it again changes nothing already there. */
export async function loadDemoAccounts(dataSource: DataSource): Promise<number> {
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  for (const person of DEMO_STAFF) {
    await dataSource.query(
      `INSERT INTO user_account (email, name, role, password_hash) VALUES ($1, $2, $3, $4) ON CONFLICT (email) DO NOTHING`,
      [person.email, person.name, person.role, passwordHash],
    );
  }
  return DEMO_STAFF.length;
}
