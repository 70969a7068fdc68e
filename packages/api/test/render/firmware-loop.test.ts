/**
 * The hand-off is self-sufficient: a loop written in C the way a firmware engineer would from
 * README.txt's arithmetic, using nothing but the generated header's constants, reproduces the
 * release's golden vectors bit for bit from their input column (gcc -std=c11 -Wall -Wextra -Werror).
 * The same for VHDL and Verilog is the release's own reference RTL (test/rtl/reference-rtl.test.ts).
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { exampleSpecs, mainsSyncSpec, type LoopSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { artifactNames, type Manifest } from '../../src/render/artifacts.ts';
import { renderRelease } from './release.ts';
import { workDir } from './toolchains.ts';

function loopSource(header: string, prefix: string, sections: number): string {
  const c = (s: string) => `${prefix}_${s}`;
  const coef = Array.from({ length: sections }, (_, k) => `{ ${['B0', 'B1', 'B2', 'A1', 'A2'].map((n) => c(`S${k}_${n}`)).join(', ')} }`).join(', ');
  return `#include <inttypes.h>
#include <stdio.h>
#include <string.h>
#include "${header}"

#define D ${c('DATA_BITS')}
#define WC ${c('COEF_BITS')}
#define FC ${c('COEF_FRACTION_BITS')}
#define WA ${c('ACC_BITS')}
#define N ${c('NCO_ACC_BITS')}
#define P ${c('NCO_PHASE_BITS')}
#define B ${c('NCO_AMPLITUDE_BITS')}
#define SECTIONS ${c('SECTION_COUNT')}

static const int64_t coef[SECTIONS][5] = { ${coef} };

/* round_s: floor division by 2^s, then the release's rounding mode on the remainder. */
static int64_t round_s(int64_t p, int s) {
  if (s <= 0) return p;
  int64_t q = p >> s; /* gcc: arithmetic shift of negative values */
  int64_t r = p - q * ((int64_t)1 << s);
  int64_t h = (int64_t)1 << (s - 1);
  if (${c('ROUNDING')} == 0) return q;
  if (r > h) return q + 1;
  if (r < h) return q;
  if (${c('ROUNDING')} == 1) return p >= 0 ? q + 1 : q;
  return (q & 1) ? q + 1 : q;
}

static int64_t reduce(int64_t v, int w) {
  if (w >= 64) return v;
  int64_t max = ((int64_t)1 << (w - 1)) - 1, min = -max - 1;
  if (${c('OVERFLOW_SATURATE')}) return v > max ? max : v < min ? min : v;
  uint64_t m = ((uint64_t)1 << w) - 1, low = (uint64_t)v & m;
  return (low >> (w - 1)) ? (int64_t)(low | ~m) : (int64_t)low;
}

int main(void) {
  char line[512];
  uint64_t phase = 0;
  const uint64_t mask = N >= 64 ? UINT64_MAX : (((uint64_t)1 << N) - 1);
  int64_t x1[SECTIONS] = { 0 }, x2[SECTIONS] = { 0 }, y1[SECTIONS] = { 0 }, y2[SECTIONS] = { 0 };
  if (!fgets(line, sizeof line, stdin)) return 3;
  fputs(line, stdout);
  for (long n = 0; fgets(line, sizeof line, stdin); n++) {
    long long ignored, x;
    if (sscanf(line, "%lld,%lld", &ignored, &x) != 2) return 4;
    uint64_t a = ((phase >> (N - P)) + ((uint64_t)1 << (P - 2))) & (((uint64_t)1 << P) - 1);
    int64_t cval = ${c('NCO_SQUARE')} ? (a < ((uint64_t)1 << (P - 1)) ? ${c('NCO_FULL_SCALE')} : -${c('NCO_FULL_SCALE')}) : ${c('SINE')}[a];
    int64_t u = reduce(round_s((int64_t)x * cval, B - 1), D);
    int64_t v = u;
    for (int k = 0; k < SECTIONS; k++) {
      int64_t acc = coef[k][0] * v + coef[k][1] * x1[k] + coef[k][2] * x2[k] - coef[k][3] * y1[k] - coef[k][4] * y2[k];
      if (WA < WC + D + 1) acc = reduce(acc, WA);
      int64_t y = reduce(round_s(acc, FC), D);
      x2[k] = x1[k]; x1[k] = v; y2[k] = y1[k]; y1[k] = y; v = y;
    }
    int64_t delta = ${c('NCO_GAIN_SHIFT')} > 0 ? round_s(v * ${c('NCO_GAIN_CODE')}, ${c('NCO_GAIN_SHIFT')})
                                              : (int64_t)((uint64_t)(v * ${c('NCO_GAIN_CODE')}) << -${c('NCO_GAIN_SHIFT')});
    printf("%ld,%lld,%" PRIu64 ",%" PRIu64 ",%" PRId64 ",%" PRId64 ",%" PRId64 "\\n", n, x, phase, a, cval, u, v);
    phase = (phase + ${c('NCO_TUNING_WORD')} + (uint64_t)delta) & mask;
  }
  return 0;
}
`;
}

const cases: { id: string; spec: LoopSpec }[] = [
  ...exampleSpecs.map((e) => ({ id: e.id, spec: e.spec })),
  {
    id: '48-bit NCO, 32-bit MAC that wraps, truncation, square NCO',
    spec: {
      ...mainsSyncSpec,
      name: 'square_wrap',
      nco: { ...mainsSyncSpec.nco, accumulatorBits: 48, waveform: 'square' },
      fixedPoint: { ...mainsSyncSpec.fixedPoint, accumulatorBits: 32, rounding: 'truncate', overflow: 'wrap' },
    },
  },
  { id: 'half-even rounding', spec: { ...mainsSyncSpec, name: 'half_even', fixedPoint: { ...mainsSyncSpec.fixedPoint, rounding: 'half-even' } } },
];

describe.each(cases)('a C loop from the header of $id', ({ spec }) => {
  it('reproduces every golden vector from the input codes', () => {
    const rendered = renderRelease(spec);
    const dir = workDir(rendered.files);
    const names = artifactNames(spec.name);
    const manifest = JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8')) as Manifest;
    const sections = manifest.counts.find((c) => c.name.endsWith('_SECTION_COUNT'))!.value;
    writeFileSync(join(dir, 'loop.c'), loopSource(names.cHeader, spec.name.toUpperCase(), sections));
    execFileSync('gcc', ['-std=c11', '-Wall', '-Wextra', '-Werror', '-O1', '-I', dir, '-o', join(dir, 'loop'), join(dir, 'loop.c')], { encoding: 'utf8' });
    const golden = readFileSync(join(dir, names.vectors), 'utf8');
    const out = execFileSync(join(dir, 'loop'), [], { input: golden, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
    const goldenLines = golden.trimEnd().split('\n');
    const outLines = out.trimEnd().split('\n');
    expect(outLines.length).toBe(goldenLines.length);
    const firstDifference = outLines.findIndex((l, i) => l !== goldenLines[i]);
    expect(firstDifference, `first difference at line ${firstDifference + 1}: got ${outLines[firstDifference]} expected ${goldenLines[firstDifference]}`).toBe(-1);
  });
});

describe('the C loop check', () => {
  it('fails when one coefficient in the header is off by one LSB', () => {
    const spec = mainsSyncSpec;
    const rendered = renderRelease(spec);
    const dir = workDir(rendered.files);
    const names = artifactNames(spec.name);
    const headerPath = join(dir, names.cHeader);
    const header = readFileSync(headerPath, 'utf8');
    const tampered = header.replace(/#define MAINS_SYNC_50HZ_S1_B0 INT32_C\((\d+)\)/, (_m, v: string) => `#define MAINS_SYNC_50HZ_S1_B0 INT32_C(${Number(v) + 1})`);
    expect(tampered).not.toBe(header);
    writeFileSync(headerPath, tampered);
    writeFileSync(join(dir, 'loop.c'), loopSource(names.cHeader, 'MAINS_SYNC_50HZ', 2));
    execFileSync('gcc', ['-std=c11', '-Wall', '-Wextra', '-Werror', '-O1', '-I', dir, '-o', join(dir, 'loop'), join(dir, 'loop.c')]);
    const golden = readFileSync(join(dir, names.vectors), 'utf8');
    const out = execFileSync(join(dir, 'loop'), [], { input: golden, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
    expect(out).not.toBe(golden);
  });
});
