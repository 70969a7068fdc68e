/**
 * The loop of README.txt's arithmetic in Verilog, using only the generated include: it reads the
 * golden CSV with $fscanf and stops with $fatal at the first sample whose phase, table address, NCO
 * code, detector or filter output differs. Signed arithmetic on the included localparams is what it
 * proves beyond the value checker: an unsigned coefficient would zero-extend and diverge.
 */
export function verilogLoopSource(include: string, prefix: string, sections: number, csvPath: string): string {
  const c = (s: string) => `${prefix}_${s}`;
  const coefCases = Array.from({ length: sections }, (_, k) =>
    ['B0', 'B1', 'B2', 'A1', 'A2'].map((n, i) => `      ${k * 5 + i}: coef = ${c(`S${k}_${n}`)};`).join('\n'),
  ).join('\n');
  return `\`timescale 1ns / 1ps
module lw_loop;
\`include "${include}"
  localparam integer D = ${c('DATA_BITS')};
  localparam integer WC = ${c('COEF_BITS')};
  localparam integer FC = ${c('COEF_FRACTION_BITS')};
  localparam integer WA = ${c('ACC_BITS')};
  localparam integer N = ${c('NCO_ACC_BITS')};
  localparam integer P = ${c('NCO_PHASE_BITS')};
  localparam integer B = ${c('NCO_AMPLITUDE_BITS')};
  localparam integer SECTIONS = ${c('SECTION_COUNT')};

  function automatic signed [63:0] coef(input integer index);
    case (index)
${coefCases}
      default: coef = 64'sd0;
    endcase
  endfunction

  function automatic signed [63:0] round_s(input signed [63:0] p, input integer s);
    reg signed [63:0] q, r, h;
    begin
      if (s <= 0) round_s = p;
      else begin
        q = p >>> s;
        r = p - (q <<< s);
        h = 64'sd1 <<< (s - 1);
        if (${c('ROUNDING')} == 0) round_s = q;
        else if (r > h) round_s = q + 64'sd1;
        else if (r < h) round_s = q;
        else if (${c('ROUNDING')} == 1) round_s = (p >= 0) ? q + 64'sd1 : q;
        else round_s = q[0] ? q + 64'sd1 : q;
      end
    end
  endfunction

  function automatic signed [63:0] reduce(input signed [63:0] v, input integer w);
    reg signed [63:0] mx, mn;
    reg [63:0] m, low;
    begin
      if (w >= 64) reduce = v;
      else if (${c('OVERFLOW_SATURATE')} == 1) begin
        mx = (64'sd1 <<< (w - 1)) - 64'sd1;
        mn = -mx - 64'sd1;
        reduce = v > mx ? mx : (v < mn ? mn : v);
      end else begin
        m = (64'd1 << w) - 64'd1;
        low = v & m;
        reduce = low[w - 1] ? $signed(low | ~m) : $signed(low);
      end
    end
  endfunction

  reg signed [63:0] x1 [0:SECTIONS - 1];
  reg signed [63:0] x2 [0:SECTIONS - 1];
  reg signed [63:0] y1 [0:SECTIONS - 1];
  reg signed [63:0] y2 [0:SECTIONS - 1];
  reg signed [63:0] x, cval, u, v, acc, y, delta, gx, gu, gy, gc;
  reg [63:0] phase, a, mask, gphase, ga, gn;
  reg [P - 1:0] address;
  reg [8 * 256:1] header;
  integer fd, k, count, got;

  initial begin
    for (k = 0; k < SECTIONS; k = k + 1) begin
      x1[k] = 0; x2[k] = 0; y1[k] = 0; y2[k] = 0;
    end
    phase = 64'd0;
    mask = (N >= 64) ? ~64'd0 : ((64'd1 << N) - 64'd1);
    count = 0;
    fd = $fopen("${csvPath}", "r");
    if (fd == 0) $fatal(1, "cannot open the golden vectors");
    got = $fgets(header, fd);
    while (!$feof(fd)) begin
      got = $fscanf(fd, "%d,%d,%d,%d,%d,%d,%d\\n", gn, gx, gphase, ga, gc, gu, gy);
      if (got == 7) begin
        x = gx;
        a = ((phase >> (N - P)) + (64'd1 << (P - 2))) & ((64'd1 << P) - 64'd1);
        address = a[P - 1:0];
        if (${c('NCO_SQUARE')} == 1) cval = (a < (64'd1 << (P - 1))) ? ${c('NCO_FULL_SCALE')} : -${c('NCO_FULL_SCALE')};
        else cval = ${c('SINE')}(address);
        u = reduce(round_s(x * cval, B - 1), D);
        v = u;
        for (k = 0; k < SECTIONS; k = k + 1) begin
          acc = coef(5 * k) * v + coef(5 * k + 1) * x1[k] + coef(5 * k + 2) * x2[k] - coef(5 * k + 3) * y1[k] - coef(5 * k + 4) * y2[k];
          if (WA < WC + D + 1) acc = reduce(acc, WA);
          y = reduce(round_s(acc, FC), D);
          x2[k] = x1[k]; x1[k] = v; y2[k] = y1[k]; y1[k] = y; v = y;
        end
        if (${c('NCO_GAIN_SHIFT')} > 0) delta = round_s(v * ${c('NCO_GAIN_CODE')}, ${c('NCO_GAIN_SHIFT')});
        else delta = (v * ${c('NCO_GAIN_CODE')}) <<< (-${c('NCO_GAIN_SHIFT')});
        if (phase !== gphase) $fatal(1, "nco_phase differs at sample %0d", count);
        if (a !== ga) $fatal(1, "table_address differs at sample %0d", count);
        if (cval !== gc) $fatal(1, "nco_code differs at sample %0d", count);
        if (u !== gu) $fatal(1, "detector_code differs at sample %0d", count);
        if (v !== gy) $fatal(1, "filter_code differs at sample %0d", count);
        phase = (phase + ${c('NCO_TUNING_WORD')} + delta) & mask;
        count = count + 1;
      end
    end
    $fclose(fd);
    $display("matched %0d samples", count);
    $finish;
  end
endmodule
`;
}
