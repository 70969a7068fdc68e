/**
 * The hex memory files hold the golden vectors column by column: one word per line, exactly
 * ceil(W/4) digits (the layout $readmemh reads, IEEE 1364-2005 §17.2.9, section number from memory),
 * two's complement for the signed columns, and every value equal to the CSV's.
 */
import { mainsSyncSpec, type LoopSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { renderRelease } from './release.ts';
import { hexColumns, hexFileName } from '../../src/render/hexVectors.ts';

const wide: LoopSpec = {
  ...mainsSyncSpec,
  name: 'hex_wide',
  nco: { ...mainsSyncSpec.nco, accumulatorBits: 64, amplitudeBits: 13 },
  fixedPoint: { ...mainsSyncSpec.fixedPoint, dataBits: 10, coefficientBits: 22 },
};

describe.each([mainsSyncSpec, wide])('hex files of $name', (spec) => {
  it('decode to the CSV column of every sample', () => {
    const rendered = renderRelease(spec);
    const text = (name: string) => rendered.files.find((f) => f.name === name)!.bytes.toString('utf8');
    const [header, ...rows] = text(`${spec.name}_vectors.csv`).trimEnd().split('\n');
    const columns = header!.split(',');
    for (const { column, widthBits, signed } of hexColumns(spec)) {
      const lines = text(hexFileName(spec.name, column)).split('\n');
      expect(lines.pop()).toBe('');
      expect(lines).toHaveLength(rows.length);
      const index = columns.indexOf(column);
      const digits = Math.ceil(widthBits / 4);
      lines.forEach((line, n) => {
        expect(line).toMatch(new RegExp(`^[0-9a-f]{${digits}}$`));
        const raw = BigInt(`0x${line}`);
        const value = signed && raw >= 1n << BigInt(widthBits - 1) ? raw - (1n << BigInt(widthBits)) : raw;
        if (value !== BigInt(rows[n]!.split(',')[index]!)) expect(`${column}[${n}] = ${value}`).toBe(`${column}[${n}] = ${rows[n]!.split(',')[index]}`);
      });
    }
  });
});
