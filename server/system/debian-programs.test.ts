import { describe, expect, it } from 'vitest';
import { quietLogger } from '../log/logger.js';
import { ensureDebianPrograms, findProgram } from './debian-programs.js';

describe('finding and installing programs', () => {
  it('finds a program every POSIX system has, and none that does not exist', () => {
    // POSIX requires a shell named sh on the path (common practice).
    expect(findProgram('sh')).toMatch(/\/sh$/);
    expect(findProgram('kneepoint-no-such-program')).toBeUndefined();
  });

  it('names every program with its path when all are there', () => {
    const found = ensureDebianPrograms({
      programs: { shell: 'sh' }, product: 'A shell', notFound: 'sh was not found.', installHint: 'Install it with', installCommand: 'true',
    }, quietLogger, false);
    expect(found.shell).toBe(findProgram('sh'));
  });

  it('stops with the exact install command when one is missing and installing is not allowed', () => {
    const want = {
      programs: { shell: 'sh', missing: 'kneepoint-no-such-program' }, product: 'Northgate tools',
      notFound: 'The Northgate tools (sh, kneepoint-no-such-program) were not found.', installHint: 'Install them as root with',
      installCommand: 'apt-get install -y northgate-tools',
    };
    expect(() => ensureDebianPrograms(want, quietLogger, false))
      .toThrow('The Northgate tools (sh, kneepoint-no-such-program) were not found.\nInstall them as root with:\n  apt-get install -y northgate-tools');
  });
});
