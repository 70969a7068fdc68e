import { describe, expect, it } from 'vitest';
import { codeNames, commentText, vhdlIdentifier } from '../../src/render/identifiers.ts';

describe('identifiers of generated code', () => {
  it('derives every name from the design name', () => {
    const n = codeNames('mains_sync_50hz');
    expect(n.prefix).toBe('MAINS_SYNC_50HZ');
    expect(n.vhdlPackage).toBe('mains_sync_50hz_pkg');
    expect(n.constant('S0_B0')).toBe('MAINS_SYNC_50HZ_S0_B0');
  });

  it('refuses a name outside [a-z][a-z0-9_]{0,39}', () => {
    expect(() => codeNames('Bad-Name')).toThrow(/name: "Bad-Name" is not a valid design name/);
    expect(() => codeNames('a'.repeat(41))).toThrow(/not a valid design name/);
    expect(() => codeNames('x; drop')).toThrow(/not a valid design name/);
  });

  it('uses a VHDL extended identifier where a basic one is illegal', () => {
    // IEEE 1076-2008 §15.4.2 (section number from memory): no doubled or trailing underscore in a basic identifier.
    expect(vhdlIdentifier('a_b')).toBe('a_b');
    expect(vhdlIdentifier('a__b')).toBe('\\a__b\\');
    expect(vhdlIdentifier('a_')).toBe('\\a_\\');
  });

  it('keeps comment text from closing a comment or splicing a line', () => {
    expect(commentText('x */ y\n#define Z \\')).toBe('x ?/ y??define Z ?');
  });
});
