/**
 * Identifiers of generated code, derived only from the validated design `name`
 * ([a-z][a-z0-9_]{0,39}, enforced again here so no other text can reach an identifier).
 */

const DESIGN_NAME = /^[a-z][a-z0-9_]{0,39}$/;

/** VHDL basic identifier: letter first, no doubled or trailing underscore (IEEE 1076-2008 §15.4.2, section number from memory). */
const VHDL_BASIC = /^[A-Za-z](?:_?[A-Za-z0-9])*$/;

export interface CodeNames {
  /** The design name itself (lower case). */
  readonly name: string;
  /** Upper-case prefix of C macros and Verilog localparams, e.g. MAINS_SYNC_50HZ. */
  readonly prefix: string;
  /** VHDL package name, an extended identifier (\…\) when the name is not a basic one. */
  readonly vhdlPackage: string;
  /** Maps a constant suffix (e.g. S0_B0) to its VHDL constant name. */
  readonly vhdlConstant: (suffix: string) => string;
  /** C/Verilog name of a constant: prefix + suffix. */
  readonly constant: (suffix: string) => string;
  /** C name of a word type (typedef), e.g. mains_sync_50hz_coef_t; VHDL wraps it in vhdlIdentifier. */
  readonly typeName: (suffix: string) => string;
}

export function assertDesignName(name: string): void {
  if (!DESIGN_NAME.test(name)) {
    throw new Error(`name: "${name}" is not a valid design name ([a-z][a-z0-9_]{0,39})`);
  }
}

/** A basic VHDL identifier when possible; otherwise the extended form, which keeps every character. */
export function vhdlIdentifier(text: string): string {
  return VHDL_BASIC.test(text) ? text : `\\${text}\\`;
}

export function codeNames(name: string): CodeNames {
  assertDesignName(name);
  const prefix = name.toUpperCase();
  const constant = (suffix: string) => {
    if (!/^[A-Z0-9_]+$/.test(suffix)) throw new Error(`constant suffix "${suffix}" is not upper snake case`);
    return `${prefix}_${suffix}`;
  };
  return {
    name,
    prefix,
    vhdlPackage: vhdlIdentifier(`${name}_pkg`),
    vhdlConstant: (suffix) => vhdlIdentifier(constant(suffix)),
    constant,
    typeName: (suffix) => `${name}_${suffix.toLowerCase()}_t`,
  };
}

/**
 * Text that may appear in a comment of VHDL, Verilog, C or the README: printable ASCII minus every
 * character that could end a comment, splice a line or start a directive in one of them (`*`, `\`,
 * newline, `` ` ``, `#`, quotes). Everything else becomes `?`. Used only for our own generated wording.
 */
export function commentText(text: string): string {
  return text.replace(/[^A-Za-z0-9_ .,:;=+\-()[\]^%<>|~!?@&{}/]/g, '?');
}
