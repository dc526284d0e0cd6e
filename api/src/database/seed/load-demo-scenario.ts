import * as bcrypt from 'bcryptjs';
import type { DataSource } from 'typeorm';
import { DEMO_MEMBERSHIPS, DEMO_PASSWORD, DEMO_STAFF, DEMO_STUDIES } from './demo-scenario';

/** Loads (or tops up) the demo scenario; running it again changes nothing that is already there. */
export async function loadDemoScenario(dataSource: DataSource): Promise<{ staff: number; studies: number }> {
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  return dataSource.transaction(async (manager) => {
    for (const person of DEMO_STAFF) {
      await manager.query(
        `INSERT INTO user_account (email, name, role, password_hash) VALUES ($1, $2, $3, $4)
         ON CONFLICT (email) DO NOTHING`,
        [person.email, person.name, person.role, passwordHash],
      );
    }
    for (const study of DEMO_STUDIES) {
      await manager.query(
        `INSERT INTO study (slug, title, protocol_number, design, status, target_size, budget_minor, currency, blinded)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) ON CONFLICT (slug) DO NOTHING`,
        [study.slug, study.title, study.protocolNumber, study.design, study.status, study.targetSize, study.budgetMinor, study.currency, study.blinded],
      );
    }
    for (const membership of DEMO_MEMBERSHIPS) {
      await manager.query(
        `INSERT INTO study_membership (study_id, user_id, role)
         SELECT s.id, u.id, $3 FROM study s, user_account u WHERE s.slug = $2 AND u.email = $1
         ON CONFLICT (study_id, user_id) DO NOTHING`,
        [membership.email, membership.slug, membership.role],
      );
    }
    return { staff: DEMO_STAFF.length, studies: DEMO_STUDIES.length };
  });
}
