import { JwtService } from '@nestjs/jwt';
import { randomUUID } from 'node:crypto';
import { newOpaqueToken } from '../../src/auth/session-tokens';
import type { TestApp } from './test-app';

/**
 * An access token for a user, minted with the app's own signer: lets load tests skip the e-mail round trip. The
 * session it names is written too (a refresh-token family), since every request checks that its session is live.
 */
export async function sessionFor(testApp: TestApp, userId: string): Promise<{ accessToken: string }> {
  const sessionId = randomUUID();
  await testApp.dataSource.query(
    `INSERT INTO refresh_token (user_id, family_id, token_hash, expires_at) VALUES ($1, $2, $3, now() + interval '1 hour')`,
    [userId, sessionId, newOpaqueToken().hash],
  );
  const jwt = testApp.app.get(JwtService);
  return { accessToken: await jwt.signAsync({ sub: userId, role: 'participant', sid: sessionId }, { expiresIn: 900 }) };
}
