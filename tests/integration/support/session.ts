import { vi } from 'vitest';

/**
 * Route handlers read the signed-in user through lib/auth/session; integration tests
 * stand in for next-auth by setting the user here (null = signed out).
 * Use with: vi.mock('@/lib/auth/session', () => sessionMock)
 */
export const session = { userId: null as number | null };
export const sessionMock = { getSessionUserId: vi.fn(async () => session.userId) };

export function signInAs(userId: number | null) {
  session.userId = userId;
}
