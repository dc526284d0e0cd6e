import { JwtService } from '@nestjs/jwt';
import type { TestApp } from './test-app';

/** An access token for a user, minted with the app's own signer: lets load tests skip the e-mail round trip. */
export async function sessionFor(testApp: TestApp, userId: string): Promise<{ accessToken: string }> {
  const jwt = testApp.app.get(JwtService);
  return { accessToken: await jwt.signAsync({ sub: userId, role: 'participant' }, { expiresIn: 900 }) };
}
