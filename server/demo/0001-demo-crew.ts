// The demo scenario: an invented crew prepping an invented production. Demo-only accounts.
import { hashPassword } from '../security/password';
import type { SeedFn } from './seed';
import { User } from '../db/models';

export const DEMO_PASSWORD = 'rigshelf-demo';

export const DEMO_ACCOUNTS = [
  { email: 'demo-admin@rigshelf.test', displayName: 'Maud Ferrante', role: 'admin', crewRole: 'DIT, Halfmoon Unit' },
  { email: 'demo-moderator@rigshelf.test', displayName: 'Dario Quillfeather', role: 'moderator', crewRole: 'Key grip, Halfmoon Unit' },
  { email: 'demo-member@rigshelf.test', displayName: 'Wren Halloway', role: 'member', crewRole: '1st AC, Halfmoon Unit' },
] as const;

export const up: SeedFn = async () => {
  const passwordHash = await hashPassword(DEMO_PASSWORD, 15);
  for (const account of DEMO_ACCOUNTS) {
    await User.findOrCreate({
      where: { email: account.email },
      defaults: { ...account, passwordHash, emailVerifiedAt: new Date() },
    });
  }
};
