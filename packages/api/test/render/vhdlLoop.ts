/**
 * The loop of README.txt's arithmetic in VHDL-2008 (numeric_std on 64-bit signed words), using only
 * the generated package; it reads the golden CSV with std.textio (fields parsed digit by digit, since
 * 64-bit phase words exceed VHDL's integer) and fails an assertion at the first differing sample.
 */
import { vhdlIdentifier } from '../../src/render/identifiers.ts';

/** `limit`: samples to check (GHDL's numeric_std on 64-bit words is slow; the first ones cover acquisition). */
export function vhdlLoopSource(vhdlPackage: string, prefix: string, sections: number, csvPath: string, limit: number): string {
  const c = (s: string) => vhdlIdentifier(`${prefix}_${s}`);
  const coefs = Array.from({ length: sections }, (_, k) => ['B0', 'B1', 'B2', 'A1', 'A2'].map((n) => `resize(${c(`S${k}_${n}`)}, 64)`)).flat();
  return `library ieee;
use ieee.std_logic_1164.all;
use ieee.numeric_std.all;
use std.textio.all;
use work.${vhdlPackage}.all;

entity lw_loop is
end entity lw_loop;

architecture sim of lw_loop is
  subtype s64 is signed(63 downto 0);
  subtype u64 is unsigned(63 downto 0);
  constant D : natural := ${c('DATA_BITS')};
  constant WC : natural := ${c('COEF_BITS')};
  constant FC : natural := ${c('COEF_FRACTION_BITS')};
  constant WA : natural := ${c('ACC_BITS')};
  constant N : natural := ${c('NCO_ACC_BITS')};
  constant P : natural := ${c('NCO_PHASE_BITS')};
  constant B : natural := ${c('NCO_AMPLITUDE_BITS')};
  constant SECTIONS : natural := ${c('SECTION_COUNT')};
  type coef_t is array (0 to 5 * SECTIONS - 1) of s64;
  constant COEF : coef_t := (${coefs.join(', ')});
  type state_t is array (0 to SECTIONS - 1) of s64;

  function round_s(p : s64; s : integer) return s64 is
    variable q, r, h : s64;
  begin
    if s <= 0 then
      return p;
    end if;
    q := shift_right(p, s);
    r := p - shift_left(q, s);
    h := shift_left(to_signed(1, 64), s - 1);
    if ${c('ROUNDING')} = 0 then
      return q;
    elsif r > h then
      return q + 1;
    elsif r < h then
      return q;
    elsif ${c('ROUNDING')} = 1 then
      if p >= 0 then return q + 1; else return q; end if;
    elsif q(0) = '1' then
      return q + 1;
    else
      return q;
    end if;
  end function;

  function reduce(v : s64; w : natural) return s64 is
    variable mx : s64;
  begin
    if w >= 64 then
      return v;
    elsif ${c('OVERFLOW_SATURATE')} = 1 then
      mx := shift_left(to_signed(1, 64), w - 1) - 1;
      if v > mx then return mx; elsif v < -mx - 1 then return -mx - 1; else return v; end if;
    else
      return resize(v(w - 1 downto 0), 64);
    end if;
  end function;

  function mul(a, b : s64) return s64 is
  begin
    return resize(a * b, 64);
  end function;

  -- One comma-separated decimal field, digit by digit into 65 bits (a 64-bit unsigned phase fits).
  procedure read_field(l : inout line; value : out signed(64 downto 0)) is
    variable ch : character;
    variable ok : boolean;
    variable acc : signed(64 downto 0) := (others => '0');
    variable neg : boolean := false;
  begin
    loop
      read(l, ch, ok);
      exit when not ok or ch = ',';
      if ch = '-' then
        neg := true;
      elsif ch >= '0' and ch <= '9' then
        acc := resize(acc * 10, 65) + (character'pos(ch) - character'pos('0'));
      end if;
    end loop;
    if neg then acc := -acc; end if;
    value := acc;
  end procedure;
begin
  process
    file f : text open read_mode is "${csvPath}";
    variable l : line;
    variable field : signed(64 downto 0);
    variable gx, gc, gu, gy : s64;
    variable gphase, ga : u64;
    variable x1, x2, y1, y2 : state_t := (others => (others => '0'));
    variable x, cval, u, v, acc, y, delta : s64;
    variable phase : u64 := (others => '0');
    variable a : u64;
    variable mask : u64;
    variable count : natural := 0;
  begin
    if N >= 64 then mask := (others => '1'); else mask := shift_left(to_unsigned(1, 64), N) - 1; end if;
    readline(f, l); -- header
    while not endfile(f) and count < ${limit} loop
      readline(f, l);
      next when l'length = 0;
      read_field(l, field); -- sample
      read_field(l, field); gx := field(63 downto 0);
      read_field(l, field); gphase := unsigned(field(63 downto 0));
      read_field(l, field); ga := unsigned(field(63 downto 0));
      read_field(l, field); gc := field(63 downto 0);
      read_field(l, field); gu := field(63 downto 0);
      read_field(l, field); gy := field(63 downto 0);
      x := gx;
      a := (shift_right(phase, N - P) + shift_left(to_unsigned(1, 64), P - 2)) and (shift_left(to_unsigned(1, 64), P) - 1);
      if ${c('NCO_SQUARE')} = 1 then
        if a < shift_left(to_unsigned(1, 64), P - 1) then cval := to_signed(${c('NCO_FULL_SCALE')}, 64); else cval := -to_signed(${c('NCO_FULL_SCALE')}, 64); end if;
      else
        cval := resize(${c('SINE')}(to_integer(a)), 64);
      end if;
      u := reduce(round_s(mul(x, cval), B - 1), D);
      v := u;
      for k in 0 to SECTIONS - 1 loop
        acc := mul(COEF(5 * k), v) + mul(COEF(5 * k + 1), x1(k)) + mul(COEF(5 * k + 2), x2(k)) - mul(COEF(5 * k + 3), y1(k)) - mul(COEF(5 * k + 4), y2(k));
        if WA < WC + D + 1 then acc := reduce(acc, WA); end if;
        y := reduce(round_s(acc, FC), D);
        x2(k) := x1(k); x1(k) := v; y2(k) := y1(k); y1(k) := y; v := y;
      end loop;
      if ${c('NCO_GAIN_SHIFT')} > 0 then
        delta := round_s(mul(v, resize(${c('NCO_GAIN_CODE')}, 64)), ${c('NCO_GAIN_SHIFT')});
      else
        delta := shift_left(mul(v, resize(${c('NCO_GAIN_CODE')}, 64)), -${c('NCO_GAIN_SHIFT')});
      end if;
      assert phase = gphase report "nco_phase differs at sample " & integer'image(count) severity error;
      assert a = ga report "table_address differs at sample " & integer'image(count) severity error;
      assert cval = gc report "nco_code differs at sample " & integer'image(count) severity error;
      assert u = gu report "detector_code differs at sample " & integer'image(count) severity error;
      assert v = gy report "filter_code differs at sample " & integer'image(count) severity error;
      phase := (phase + resize(${c('NCO_TUNING_WORD')}, 64) + unsigned(delta)) and mask;
      count := count + 1;
    end loop;
    report "matched " & integer'image(count) & " samples";
    wait;
  end process;
end architecture sim;
`;
}
