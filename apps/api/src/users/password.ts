import { compare, hash } from 'bcryptjs';

/** bcrypt cost 10: common practice default; about 50-100 ms per hash with bcryptjs. */
export const BCRYPT_ROUNDS = 10;

export const hashPassword = (plain: string): Promise<string> => hash(plain, BCRYPT_ROUNDS);
export const verifyPassword = (plain: string, passwordHash: string): Promise<boolean> => compare(plain, passwordHash);

let dummyHash: Promise<string> | undefined;
/** A real hash of a random string: compared against when the email is unknown, so response timing does not reveal which emails exist. */
export const dummyPasswordHash = (): Promise<string> => (dummyHash ??= hash(`unused-${Math.random()}`, BCRYPT_ROUNDS));
