/**
 * Runs the real toolchains over rendered artifacts: GHDL (VHDL-2008), Icarus Verilog (IEEE 1800-2012
 * mode) and gcc (C11, -Wall -Wextra -Werror), and writes a small checker in each language from the
 * manifest's decimal codes, so each compiler itself confirms that the constants equal the manifest.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Manifest } from '../../src/render/artifacts.ts';
import { vhdlIdentifier } from '../../src/render/identifiers.ts';

export interface ToolRun {
  readonly ok: boolean;
  readonly output: string;
}

function run(cmd: string, args: string[], cwd: string): ToolRun {
  try {
    const out = execFileSync(cmd, args, { cwd, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    return { ok: true, output: out };
  } catch (err) {
    const e = err as { stdout?: string; stderr?: string; message: string };
    return { ok: false, output: `${cmd} ${args.join(" ")}\n${(e.stdout ?? "").slice(0, 4000)}${(e.stderr ?? "").slice(0, 4000)}${e.message.slice(0, 500)}` };
  }
}

/** Runs each step in order; stops at the first failure. */
function steps(cwd: string, list: [string, string[]][]): ToolRun {
  let output = '';
  for (const [cmd, args] of list) {
    const r = run(cmd, args, cwd);
    output += r.output;
    if (!r.ok) return { ok: false, output };
  }
  return { ok: true, output };
}

export function workDir(files: readonly { name: string; bytes: Uint8Array }[]): string {
  const dir = mkdtempSync(join(tmpdir(), 'lw-render-'));
  for (const f of files) writeFileSync(join(dir, f.name), f.bytes);
  return dir;
}

// --- VHDL --------------------------------------------------------------------------------------

function vhdlChecker(manifest: Manifest, vhdlPackage: string): string {
  const asserts = [
    ...manifest.constants.map((c) => {
      const n = vhdlIdentifier(c.name);
      return [
        `    assert ${n}'length = ${c.widthBits} report "${c.name} width" severity error;`,
        `    assert std_logic_vector(${n}) = from_decimal("${c.code}", ${c.widthBits}) report "${c.name} value" severity error;`,
      ].join('\n');
    }),
    ...manifest.counts.map(
      (c) => `    assert ${vhdlIdentifier(c.name)} = ${c.value} report "${c.name} value" severity error;`,
    ),
  ];
  const tableDecls = manifest.tables.map((t, i) => `  constant E_TABLE_${i} : expected_table(0 to ${t.codes.length - 1}) := (${t.codes.join(', ')});`);
  const tableChecks = manifest.tables.map((t, i) => {
    const n = vhdlIdentifier(t.name);
    return [
      `    assert ${n}'length = ${t.codes.length} report "${t.name} length" severity error;`,
      `    assert ${n}(0)'length = ${t.widthBits} report "${t.name} width" severity error;`,
      `    for k in E_TABLE_${i}'range loop`,
      `      assert to_integer(${n}(k)) = E_TABLE_${i}(k) report "${t.name} value at " & integer'image(k) severity error;`,
      '    end loop;',
    ].join('\n');
  });
  return `library ieee;
use ieee.std_logic_1164.all;
use ieee.numeric_std.all;
use work.${vhdlPackage}.all;

entity lw_check is
end entity lw_check;

architecture sim of lw_check is
  -- Parses the manifest's decimal text in VHDL itself, in a 72-bit accumulator, and keeps the low w bits.
  function from_decimal(s : string; w : positive) return std_logic_vector is
    variable acc : signed(71 downto 0) := (others => '0');
    variable neg : boolean := false;
  begin
    for i in s'range loop
      if s(i) = '-' then
        neg := true;
      else
        acc := resize(acc * 10, 72) + (character'pos(s(i)) - character'pos('0'));
      end if;
    end loop;
    if neg then
      acc := -acc;
    end if;
    return std_logic_vector(acc(w - 1 downto 0));
  end function;
  type expected_table is array (natural range <>) of integer;
${tableDecls.join('\n')}
begin
  process
  begin
${asserts.join('\n')}
${tableChecks.join('\n')}
    report "checked ${manifest.constants.length + manifest.counts.length} constants";
    wait;
  end process;
end architecture sim;
`;
}

export function checkVhdl(dir: string, vhdlFile: string, vhdlPackage: string, manifest: Manifest): ToolRun {
  writeFileSync(join(dir, 'lw_check.vhd'), vhdlChecker(manifest, vhdlPackage));
  const std = ['--std=08', `--workdir=${dir}`];
  return steps(dir, [
    ['ghdl', ['-a', ...std, vhdlFile]],
    ['ghdl', ['-a', ...std, 'lw_check.vhd']],
    ['ghdl', ['-e', ...std, 'lw_check']],
    ['ghdl', ['-r', ...std, 'lw_check', '--assert-level=error']],
  ]);
}

// --- Verilog -----------------------------------------------------------------------------------

function verilogChecker(manifest: Manifest, include: string): string {
  // Expected values live in 128-bit words, far wider than any code, so no literal edge case of the
  // generator (the most negative value) is repeated here.
  const lines = manifest.constants.map((c, i) => {
    const neg = c.code.startsWith('-');
    const abs = neg ? c.code.slice(1) : c.code;
    const expected =
      c.signedness === 'signed'
        ? `localparam signed [127:0] E${i} = ${neg ? '-' : ''}128'sd${abs};`
        : `localparam [127:0] E${i} = 128'd${abs};`;
    const actual = c.signedness === 'signed' ? `$signed(${c.name})` : c.name;
    return {
      decl: expected,
      check: `    if ($bits(${c.name}) != ${c.widthBits}) $fatal(1, "${c.name} width");\n    if (${actual} != E${i}) $fatal(1, "${c.name} value");`,
    };
  });
  const counts = manifest.counts.map((c) => `    if (${c.name} != ${c.value}) $fatal(1, "${c.name} value");`);
  const tables = manifest.tables.map((t, i) => {
    const bits = Math.max(1, Math.ceil(Math.log2(t.codes.length)));
    return {
      decl: `  integer e_table_${i} [0:${t.codes.length - 1}];\n  reg [${bits - 1}:0] address_${i};`,
      fill: t.codes.map((c, k) => `    e_table_${i}[${k}] = ${c};`).join('\n'),
      check: [
        `    for (k = 0; k < ${t.codes.length}; k = k + 1) begin`,
        `      address_${i} = k;`,
        `      if ($bits(${t.name}(address_${i})) != ${t.widthBits}) $fatal(1, "${t.name} width");`,
        `      if ($signed(${t.name}(address_${i})) != e_table_${i}[k]) $fatal(1, "${t.name} value at %0d", k);`,
        '    end',
      ].join('\n'),
    };
  });
  return `\`timescale 1ns / 1ps
module lw_check;
\`include "${include}"
${lines.map((l) => l.decl).join('\n')}
  integer k;
${tables.map((t) => t.decl).join('\n')}
  initial begin
${tables.map((t) => t.fill).join('\n')}
${lines.map((l) => l.check).join('\n')}
${counts.join('\n')}
${tables.map((t) => t.check).join('\n')}
    $display("checked ${manifest.constants.length + manifest.counts.length} constants");
    $finish;
  end
endmodule
`;
}

export function checkVerilog(dir: string, include: string, manifest: Manifest): ToolRun {
  writeFileSync(join(dir, 'lw_check.v'), verilogChecker(manifest, include));
  const compiled = run('iverilog', ['-g2012', '-Wall', '-I', dir, '-o', 'lw_check.vvp', 'lw_check.v'], dir);
  // -Wall findings are printed without failing the compile: any output counts as a failure.
  if (!compiled.ok || compiled.output.trim() !== '') return { ok: false, output: compiled.output };
  return run('vvp', ['-n', 'lw_check.vvp'], dir);
}

// --- C -----------------------------------------------------------------------------------------

function cChecker(manifest: Manifest, header: string): string {
  const checks = manifest.constants.map((c) => {
    const parse =
      c.signedness === 'signed'
        ? `(int64_t)(${c.name}) != strtoll("${c.code}", NULL, 10)`
        : `(uint64_t)(${c.name}) != strtoull("${c.code}", NULL, 10)`;
    const width = c.widthBits > 32 ? `  _Static_assert(sizeof(${c.name}) == 8, "${c.name} needs a 64-bit type");\n` : '';
    return `${width}  if (${parse}) { fprintf(stderr, "${c.name}\\n"); failures++; }`;
  });
  const counts = manifest.counts.map((c) => `  if (${c.name} != ${c.value}) { fprintf(stderr, "${c.name}\\n"); failures++; }`);
  const tableDecls = manifest.tables.map((t, i) => `static const long long e_table_${i}[] = { ${t.codes.join(', ')} };`);
  const tableChecks = manifest.tables.map((t, i) =>
    [
      `  _Static_assert(sizeof ${t.name} / sizeof ${t.name}[0] == ${t.codes.length}, "${t.name} length");`,
      `  for (size_t k = 0; k < ${t.codes.length}; k++) {`,
      `    if ((long long)${t.name}[k] != e_table_${i}[k]) { fprintf(stderr, "${t.name} value at %zu\\n", k); failures++; }`,
      '  }',
    ].join('\n'),
  );
  return `#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include "${header}"

${tableDecls.join('\n')}

int main(void) {
  int failures = 0;
${checks.join('\n')}
${counts.join('\n')}
${tableChecks.join('\n')}
  printf("checked ${manifest.constants.length + manifest.counts.length} constants\\n");
  return failures == 0 ? 0 : 1;
}
`;
}

export function checkC(dir: string, header: string, manifest: Manifest): ToolRun {
  writeFileSync(join(dir, 'lw_check.c'), cChecker(manifest, header));
  return steps(dir, [
    ['gcc', ['-std=c11', '-Wall', '-Wextra', '-Werror', '-pedantic', '-I', dir, '-o', 'lw_check', 'lw_check.c']],
    [join(dir, 'lw_check'), []],
  ]);
}
