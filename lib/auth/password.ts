import bcrypt from 'bcryptjs';

export const PASSWORD_COST = 10;

export const hashPassword = (plain: string): Promise<string> => bcrypt.hash(plain, PASSWORD_COST);
export const verifyPassword = (plain: string, hash: string): Promise<boolean> => bcrypt.compare(plain, hash);

/**
 * A bcrypt hash at the same cost as real ones, of a random password nobody
 * kept: sign-in compares against it when the address has no account, so an
 * unknown address takes as long to refuse as a wrong password
 * (tests/unit/auth/password.test.ts checks its cost).
 */
export const DUMMY_PASSWORD_HASH = '$2b$10$fasflPAWh4LJ4DjXywfdRe4ke0pxiox99Wfu2axA5jcCo8fac9vTi';
