;; The bit-true loop (packages/dsp/README.md, "Bit-true arithmetic") in WebAssembly: the same
;; arithmetic as src/sim/bitTrueKernel.ts and bench/loop.c, in 64-bit integers, so every intermediate
;; value is the exact integer the README defines. src/sim/wasm/assemble.ts turns this text into the
;; bytes of src/sim/wasm/kernelBytes.ts (a test checks the two agree).
;;
;; Why it is fast: every round_s(p) is branch-free, (p + h + bias) >> s with h = 2^(s-1) and
;;   nearest   (ties away from zero): bias = -(p < 0)         (a tie of a negative p rounds down),
;;   half-even (ties to even):        bias = ((p >> s) & 1) - 1 (a tie rounds up only from an odd q),
;;   truncate:                        h = bias = 0            (floor),
;; which is exact for |p| < 2^62 and equal to the README's q/r/h definition for every p (a tie is
;; r = h: p + h is then a multiple of 2^s and the bias decides; otherwise the bias, at most one LSB of
;; p, cannot carry past a multiple of 2^s). The data-dependent branches of that definition mispredict
;; on every sign change of the detector output; the branches left here test loop-invariant modes.
;;
;; Memory layout (bytes; LAYOUT in src/sim/wasm/wasmKernel.ts holds the same numbers):
;;   0      constants, one i64 each (in the order of the loads below; wasmKernel.ts writes them)
;;   160    the constants run derives from them (run writes them there and reads them back)
;;   256    state: phase accumulator (i64), checksum (i32 in an i64 slot)
;;   512    section state, 4 x i64 per section: x[n-1], x[n-2], y[n-1], y[n-2]
;;   1024   coefficient codes, 5 x i64 per section: b0 b1 b2 a1 a2
;;   2048   sine table, i32 x 2^P (P <= 16)
;;   264192 input codes, i32 x 8192 (a traced run writes them with its record)
;;   296960 outputs per sample, i32 x 8192 each: phase hi, phase lo, table address, NCO code,
;;          detector code, filter code; then the tuning increment as f64 x 8192 at 493568
(module
  ;; The traced simulation's sines are the engine's own Math.sin and Math.cos, imported, so every
  ;; value is the double the TypeScript loops compute.
  (import "math" "sin" (func $sin (param f64) (result f64)))
  (import "math" "cos" (func $cos (param f64) (result f64)))
  (memory (export "memory") 32)
  ;; `count` samples of the bit-true loop, from the state at 256. Their per-sample outputs go to the
  ;; areas above with $record, their checksum always. With $traced (wasmTraced.ts) each sample's input code
  ;; comes from the input chunk, its doubles go to the traced areas (the conversion overlaps the kernel's
  ;; feedback chain), and after the chunk the sine of its NCO phases (sinePairs, two a vector).
  (func (export "run") (param $count i32) (param $traced i32) (param $record i32) (param $own i32)
    (local $i i32) (local $o i32) (local $j i32) (local $k i32) (local $q i32)
    (local $addr i32) (local $c i32) (local $h i32)
    (local $acc i64) (local $x i64) (local $t i64) (local $u i64) (local $v i64) (local $a i64) (local $y i64)
    (local $x1 i64) (local $y1 i64)
    ;; with $traced: the quantiser's and the conversion's, and the NCO phase in cycles
    (local $qV f64) (local $qQ f64) (local $qR f64) (local $qScale f64) (local $qMode i32) (local $qMin f64) (local $qMax f64)
    (local $hiWeight f64) (local $toCycles f64) (local $yScale f64) (local $centerHz f64) (local $hzPerLsb f64) (local $ncoPhase f64)
    (local $fo i32)
    ;; constants
    (local $mode i32) (local $wrap i32) (local $macCheck i32) (local $sections i32) (local $square i32)
    (local $tableMask i32) (local $quarter i32) (local $halfTable i32) (local $fullScale i32)
    (local $dMax i64) (local $dMin i64) (local $dShift i64) (local $waMax i64) (local $waMin i64) (local $waShift i64)
    (local $phaseMask i64) (local $addrShift i64) (local $m i64) (local $g i64)
    ;; per rounding site: shift s, half h, and the mode that applies (0 when s = 0: no rounding)
    (local $detS i64) (local $detH i64) (local $detMode i32)
    (local $fcS i64) (local $fcH i64) (local $fcMode i32)
    (local $gS i64) (local $gH i64) (local $gMode i32) (local $gLeft i64)
    ;; the constants from the pool (a literal in the loop would be rebuilt in a register at every use)
    (local $twoPi f64) (local $half f64) (local $one f64) (local $two f64) (local $invpio2 f64) (local $pio2_1 f64) (local $pio2_1t f64) (local $pio2_2 f64)
    (local $pio2_2t f64) (local $pio2_3 f64) (local $pio2_3t f64) (local $S1 f64) (local $S2 f64) (local $S3 f64) (local $S4 f64) (local $S5 f64)
    (local $S6 f64) (local $C1 f64) (local $C2 f64) (local $C3 f64) (local $C4 f64) (local $C5 f64) (local $C6 f64) (local $qx f64)
    (local.set $twoPi (f64.load offset=1769728 (i32.const 0)))
    (local.set $half (f64.load offset=1769736 (i32.const 0)))
    (local.set $one (f64.load offset=1769752 (i32.const 0)))
    (local.set $two (f64.load offset=1769768 (i32.const 0)))
    (local.set $invpio2 (f64.load offset=1769776 (i32.const 0)))
    (local.set $pio2_1 (f64.load offset=1769784 (i32.const 0)))
    (local.set $pio2_1t (f64.load offset=1769792 (i32.const 0)))
    (local.set $pio2_2 (f64.load offset=1769800 (i32.const 0)))
    (local.set $pio2_2t (f64.load offset=1769808 (i32.const 0)))
    (local.set $pio2_3 (f64.load offset=1769816 (i32.const 0)))
    (local.set $pio2_3t (f64.load offset=1769824 (i32.const 0)))
    (local.set $S1 (f64.load offset=1769832 (i32.const 0)))
    (local.set $S2 (f64.load offset=1769840 (i32.const 0)))
    (local.set $S3 (f64.load offset=1769848 (i32.const 0)))
    (local.set $S4 (f64.load offset=1769856 (i32.const 0)))
    (local.set $S5 (f64.load offset=1769864 (i32.const 0)))
    (local.set $S6 (f64.load offset=1769872 (i32.const 0)))
    (local.set $C1 (f64.load offset=1769880 (i32.const 0)))
    (local.set $C2 (f64.load offset=1769888 (i32.const 0)))
    (local.set $C3 (f64.load offset=1769896 (i32.const 0)))
    (local.set $C4 (f64.load offset=1769904 (i32.const 0)))
    (local.set $C5 (f64.load offset=1769912 (i32.const 0)))
    (local.set $C6 (f64.load offset=1769920 (i32.const 0)))
    (local.set $qx (f64.load offset=1769928 (i32.const 0)))
    (local.set $mode (i32.wrap_i64 (i64.load offset=0 (i32.const 0))))
    (local.set $wrap (i32.wrap_i64 (i64.load offset=8 (i32.const 0))))
    (local.set $dMax (i64.load offset=16 (i32.const 0)))
    (local.set $dMin (i64.sub (i64.const -1) (local.get $dMax)))
    (local.set $dShift (i64.load offset=24 (i32.const 0)))
    (local.set $detS (i64.load offset=32 (i32.const 0)))
    (local.set $fcS (i64.load offset=40 (i32.const 0)))
    (local.set $macCheck (i32.wrap_i64 (i64.load offset=48 (i32.const 0))))
    (local.set $waMax (i64.load offset=56 (i32.const 0)))
    (local.set $waMin (i64.sub (i64.const -1) (local.get $waMax)))
    (local.set $waShift (i64.load offset=64 (i32.const 0)))
    (local.set $sections (i32.wrap_i64 (i64.load offset=72 (i32.const 0))))
    (local.set $phaseMask (i64.load offset=80 (i32.const 0)))
    (local.set $addrShift (i64.load offset=88 (i32.const 0)))
    (local.set $tableMask (i32.wrap_i64 (i64.load offset=96 (i32.const 0))))
    (local.set $quarter (i32.wrap_i64 (i64.load offset=104 (i32.const 0))))
    (local.set $halfTable (i32.wrap_i64 (i64.load offset=112 (i32.const 0))))
    (local.set $square (i32.wrap_i64 (i64.load offset=120 (i32.const 0))))
    (local.set $fullScale (i32.wrap_i64 (i64.load offset=128 (i32.const 0))))
    (local.set $m (i64.load offset=136 (i32.const 0)))
    (local.set $g (i64.load offset=144 (i32.const 0)))
    ;; gain shift S: S > 0 rounds y*G by S bits, S <= 0 shifts it left exactly
    (local.set $gS (i64.load offset=152 (i32.const 0)))
    (local.set $gLeft (select (i64.const 0) (i64.sub (i64.const 0) (local.get $gS)) (i64.gt_s (local.get $gS) (i64.const 0))))
    (local.set $gS (select (local.get $gS) (i64.const 0) (i64.gt_s (local.get $gS) (i64.const 0))))
    (local.set $detMode (select (local.get $mode) (i32.const 0) (i64.gt_s (local.get $detS) (i64.const 0))))
    (local.set $fcMode (select (local.get $mode) (i32.const 0) (i64.gt_s (local.get $fcS) (i64.const 0))))
    (local.set $gMode (select (local.get $mode) (i32.const 0) (i64.gt_s (local.get $gS) (i64.const 0))))
    (local.set $detH (select (i64.shr_u (i64.shl (i64.const 1) (local.get $detS)) (i64.const 1)) (i64.const 0) (local.get $detMode)))
    (local.set $fcH (select (i64.shr_u (i64.shl (i64.const 1) (local.get $fcS)) (i64.const 1)) (i64.const 0) (local.get $fcMode)))
    (local.set $gH (select (i64.shr_u (i64.shl (i64.const 1) (local.get $gS)) (i64.const 1)) (i64.const 0) (local.get $gMode)))
    ;; the derived constants through memory and back: V8 otherwise recomputes each at every use in the loop
    (i64.store offset=160 (i32.const 0) (local.get $dMin))
    (i64.store offset=168 (i32.const 0) (local.get $waMin))
    (i64.store offset=176 (i32.const 0) (local.get $gLeft))
    (i64.store offset=184 (i32.const 0) (local.get $gS))
    (i32.store offset=192 (i32.const 0) (local.get $detMode))
    (i32.store offset=200 (i32.const 0) (local.get $fcMode))
    (i32.store offset=208 (i32.const 0) (local.get $gMode))
    (i64.store offset=216 (i32.const 0) (local.get $detH))
    (i64.store offset=224 (i32.const 0) (local.get $fcH))
    (i64.store offset=232 (i32.const 0) (local.get $gH))
    (local.set $dMin (i64.load offset=160 (i32.const 0)))
    (local.set $waMin (i64.load offset=168 (i32.const 0)))
    (local.set $gLeft (i64.load offset=176 (i32.const 0)))
    (local.set $gS (i64.load offset=184 (i32.const 0)))
    (local.set $detMode (i32.load offset=192 (i32.const 0)))
    (local.set $fcMode (i32.load offset=200 (i32.const 0)))
    (local.set $gMode (i32.load offset=208 (i32.const 0)))
    (local.set $detH (i64.load offset=216 (i32.const 0)))
    (local.set $fcH (i64.load offset=224 (i32.const 0)))
    (local.set $gH (i64.load offset=232 (i32.const 0)))
    (local.set $acc (i64.load offset=256 (i32.const 0)))
    (local.set $h (i32.load offset=264 (i32.const 0)))
    (if (local.get $traced)
      (then
        (local.set $hiWeight (f64.load offset=1442496 (i32.const 0)))
        (local.set $toCycles (f64.load offset=1442504 (i32.const 0)))
        (local.set $yScale (f64.load offset=1442512 (i32.const 0)))
        (local.set $centerHz (f64.load offset=1442520 (i32.const 0)))
        (local.set $hzPerLsb (f64.load offset=1442528 (i32.const 0)))
        (local.set $qScale (f64.load offset=1442536 (i32.const 0)))
        (local.set $qMin (f64.load offset=1442544 (i32.const 0)))
        (local.set $qMax (f64.load offset=1442552 (i32.const 0)))
        (local.set $qMode (i32.load offset=1442560 (i32.const 0)))))
    (block $done
      (loop $sample
        (br_if $done (i32.ge_u (local.get $i) (local.get $count)))
        (local.set $o (i32.shl (local.get $i) (i32.const 2)))
        (local.set $fo (i32.shl (local.get $i) (i32.const 3)))
        ;; the input code: written by the caller, or in a traced run (wasmTraced.ts) its input sample's as
        ;; bitTrueKernel.ts quantizeInput computes it: q = floor(x*2^(D-1)), one up above a half or on a tie the
        ;; mode rounds up (nearest: v >= 0; half-even: q odd), saturated to [min, max] (an ADC clips)
        (if (local.get $traced)
          (then
            (local.set $qV (f64.mul (f64.load offset=589824 (local.get $fo)) (local.get $qScale)))
            (local.set $qQ (f64.floor (local.get $qV)))
            ;; up by (double)(test), no branch: whether a sample rounds up is as random as the noise on it
            ;; (q + 0 may turn -0 into +0, which converts to the same code)
            (if (i32.eq (local.get $qMode) (i32.const 1))
              (then
                (local.set $qR (f64.sub (local.get $qV) (local.get $qQ)))
                (local.set $qQ (f64.add (local.get $qQ) (f64.convert_i32_u
                  (i32.or (f64.gt (local.get $qR) (local.get $half))
                    (i32.and (f64.eq (local.get $qR) (local.get $half)) (f64.ge (local.get $qV) (f64.const 0))))))))
              (else (if (local.get $qMode)
                (then
                  (local.set $qR (f64.sub (local.get $qV) (local.get $qQ)))
                  (local.set $qQ (f64.add (local.get $qQ) (f64.convert_i32_u
                    (i32.or (f64.gt (local.get $qR) (local.get $half))
                      (i32.and (f64.eq (local.get $qR) (local.get $half))
                        (f64.ne (f64.sub (local.get $qQ) (f64.mul (local.get $two) (f64.floor (f64.mul (local.get $qQ) (local.get $half))))) (f64.const 0)))))))))))
            (local.set $qQ (select (local.get $qMax) (select (local.get $qMin) (local.get $qQ) (f64.lt (local.get $qQ) (local.get $qMin))) (f64.gt (local.get $qQ) (local.get $qMax))))
            (local.set $x (i64.extend_i32_s (i32.trunc_sat_f64_s (local.get $qQ)))))
          (else (local.set $x (i64.load32_s offset=264192 (local.get $o)))))
        ;; table address: top P bits of the phase plus a quarter turn (the table then gives cos)
        (local.set $addr (i32.and
          (i32.add (i32.wrap_i64 (i64.shr_u (local.get $acc) (local.get $addrShift))) (local.get $quarter))
          (local.get $tableMask)))
        (local.set $c (if (result i32) (local.get $square)
          (then (select (local.get $fullScale) (i32.sub (i32.const 0) (local.get $fullScale))
                        (i32.lt_u (local.get $addr) (local.get $halfTable))))
          (else (i32.load offset=2048 (i32.shl (local.get $addr) (i32.const 2))))))
        ;; detector u = reduce_D(round_(B-1)(x*c))
        (local.set $t (i64.mul (local.get $x) (i64.extend_i32_s (local.get $c))))
        (local.set $u (i64.shr_s
          (i64.add (i64.add (local.get $t) (local.get $detH))
            (if (result i64) (i32.eq (local.get $detMode) (i32.const 1))
              (then (i64.sub (i64.const 0) (i64.shr_u (local.get $t) (i64.const 63))))
              (else (if (result i64) (i32.eq (local.get $detMode) (i32.const 2))
                (then (i64.sub (i64.and (i64.shr_s (local.get $t) (local.get $detS)) (i64.const 1)) (i64.const 1)))
                (else (i64.const 0))))))
          (local.get $detS)))
        (if (i32.or (i64.lt_s (local.get $u) (local.get $dMin)) (i64.gt_s (local.get $u) (local.get $dMax)))
          (then (local.set $u (if (result i64) (local.get $wrap)
            (then (i64.shr_s (i64.shl (local.get $u) (local.get $dShift)) (local.get $dShift)))
            (else (select (local.get $dMax) (local.get $dMin) (i64.gt_s (local.get $u) (local.get $dMax))))))))
        ;; loop filter: direct-form-I sections; the four state products do not wait for v
        (local.set $v (local.get $u))
        (local.set $j (i32.const 0))
        (local.set $k (i32.const 1024))
        (local.set $q (i32.const 512))
        (block $sectionsDone
          (loop $section
            (br_if $sectionsDone (i32.ge_u (local.get $j) (local.get $sections)))
            (local.set $x1 (i64.load offset=0 (local.get $q)))
            (local.set $y1 (i64.load offset=16 (local.get $q)))
            (local.set $a (i64.add
              (i64.mul (i64.load offset=0 (local.get $k)) (local.get $v))
              (i64.sub
                (i64.add (i64.mul (i64.load offset=8 (local.get $k)) (local.get $x1))
                         (i64.mul (i64.load offset=16 (local.get $k)) (i64.load offset=8 (local.get $q))))
                (i64.add (i64.mul (i64.load offset=24 (local.get $k)) (local.get $y1))
                         (i64.mul (i64.load offset=32 (local.get $k)) (i64.load offset=24 (local.get $q)))))))
            (if (local.get $macCheck)
              (then (if (i32.or (i64.lt_s (local.get $a) (local.get $waMin)) (i64.gt_s (local.get $a) (local.get $waMax)))
                (then (local.set $a (if (result i64) (local.get $wrap)
                  (then (i64.shr_s (i64.shl (local.get $a) (local.get $waShift)) (local.get $waShift)))
                  (else (select (local.get $waMax) (local.get $waMin) (i64.gt_s (local.get $a) (local.get $waMax))))))))))
            (local.set $y (i64.shr_s
              (i64.add (i64.add (local.get $a) (local.get $fcH))
                (if (result i64) (i32.eq (local.get $fcMode) (i32.const 1))
                  (then (i64.sub (i64.const 0) (i64.shr_u (local.get $a) (i64.const 63))))
                  (else (if (result i64) (i32.eq (local.get $fcMode) (i32.const 2))
                    (then (i64.sub (i64.and (i64.shr_s (local.get $a) (local.get $fcS)) (i64.const 1)) (i64.const 1)))
                    (else (i64.const 0))))))
              (local.get $fcS)))
            (if (i32.or (i64.lt_s (local.get $y) (local.get $dMin)) (i64.gt_s (local.get $y) (local.get $dMax)))
              (then (local.set $y (if (result i64) (local.get $wrap)
                (then (i64.shr_s (i64.shl (local.get $y) (local.get $dShift)) (local.get $dShift)))
                (else (select (local.get $dMax) (local.get $dMin) (i64.gt_s (local.get $y) (local.get $dMax))))))))
            (i64.store offset=8 (local.get $q) (local.get $x1))
            (i64.store offset=0 (local.get $q) (local.get $v))
            (i64.store offset=24 (local.get $q) (local.get $y1))
            (i64.store offset=16 (local.get $q) (local.get $y))
            (local.set $v (local.get $y))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (local.set $k (i32.add (local.get $k) (i32.const 40)))
            (local.set $q (i32.add (local.get $q) (i32.const 32)))
            (br $section)))
        ;; the record of this sample and its FNV-1a checksum (src/sim/checksum.ts)
        (if (local.get $record)
          (then
            (i32.store offset=296960 (local.get $o) (i32.wrap_i64 (i64.shr_u (local.get $acc) (i64.const 32))))
            (i32.store offset=329728 (local.get $o) (i32.wrap_i64 (local.get $acc)))
            (i32.store offset=362496 (local.get $o) (local.get $addr))
            (i32.store offset=395264 (local.get $o) (local.get $c))
            (i32.store offset=428032 (local.get $o) (i32.wrap_i64 (local.get $u)))
            (i32.store offset=460800 (local.get $o) (i32.wrap_i64 (local.get $v)))

            (if (local.get $traced) (then (i32.store offset=264192 (local.get $o) (i32.wrap_i64 (local.get $x)))))))
        (local.set $h (i32.mul (i32.xor (local.get $h) (i32.wrap_i64 (local.get $x))) (i32.const 16777619)))
        (local.set $h (i32.mul (i32.xor (local.get $h) (i32.wrap_i64 (i64.shr_u (local.get $acc) (i64.const 32)))) (i32.const 16777619)))
        (local.set $h (i32.mul (i32.xor (local.get $h) (i32.wrap_i64 (local.get $acc))) (i32.const 16777619)))
        (local.set $h (i32.mul (i32.xor (local.get $h) (local.get $addr)) (i32.const 16777619)))
        (local.set $h (i32.mul (i32.xor (local.get $h) (local.get $c)) (i32.const 16777619)))
        (local.set $h (i32.mul (i32.xor (local.get $h) (i32.wrap_i64 (local.get $u))) (i32.const 16777619)))
        (local.set $h (i32.mul (i32.xor (local.get $h) (i32.wrap_i64 (local.get $v))) (i32.const 16777619)))
        ;; tuning increment d = round_S(y*G) (or y*G*2^-S exactly), phase += M + d mod 2^N
        (local.set $t (i64.shl (i64.mul (local.get $v) (local.get $g)) (local.get $gLeft)))
        (local.set $t (i64.shr_s
          (i64.add (i64.add (local.get $t) (local.get $gH))
            (if (result i64) (i32.eq (local.get $gMode) (i32.const 1))
              (then (i64.sub (i64.const 0) (i64.shr_u (local.get $t) (i64.const 63))))
              (else (if (result i64) (i32.eq (local.get $gMode) (i32.const 2))
                (then (i64.sub (i64.and (i64.shr_s (local.get $t) (local.get $gS)) (i64.const 1)) (i64.const 1)))
                (else (i64.const 0))))))
          (local.get $gS)))
        (if (local.get $traced)
          (then
            ;; observation block 1 (wasmTraced.ts): NCO phase hi*2^(32-N) + lo*2^-N cycles before the phase
            ;; advances, filter output y*2^-(D-1), NCO frequency M' + delta*fs/2^N (simulate.ts bitTrueRunner)
            (local.set $ncoPhase (f64.add (f64.mul (f64.convert_i32_u (i32.wrap_i64 (i64.shr_u (local.get $acc) (i64.const 32)))) (local.get $hiWeight))
              (f64.mul (f64.convert_i32_u (i32.wrap_i64 (local.get $acc))) (local.get $toCycles))))
            (f64.store offset=1114112 (local.get $fo) (local.get $ncoPhase))
            (f64.store offset=1179648 (local.get $fo) (f64.mul (f64.convert_i32_s (i32.wrap_i64 (local.get $v))) (local.get $yScale)))
            (f64.store offset=1245184 (local.get $fo) (f64.add (local.get $centerHz) (f64.mul (f64.convert_i64_s (local.get $t)) (local.get $hzPerLsb)))))
          (else (f64.store offset=493568 (local.get $fo) (f64.convert_i64_s (local.get $t)))))
        (local.set $acc (i64.and (i64.add (i64.add (local.get $acc) (local.get $m)) (local.get $t)) (local.get $phaseMask)))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $sample)))
    (i64.store offset=256 (i32.const 0) (local.get $acc))
    (i32.store offset=264 (i32.const 0) (local.get $h))
    ;; sin(2*pi*NCO phase) for the quadrature arm
    (if (local.get $traced) (then (call $sinePairs (local.get $count) (i32.const 1114112) (i32.const 2031616) (i32.const 0) (f64.const 0) (i32.const 0) (local.get $own)))))

  ;; ---- The traced simulation (src/sim/wasm/wasmTraced.ts) ----
  ;; The float loop, the bit-true loop's input codes and conversion to doubles (in run), and the per-sample part of the
  ;; trace and metric accumulator, each the same double operations in the same order as its
  ;; TypeScript twin (floatKernel.ts, simulate.ts, runAccumulator.ts), so every result is the same
  ;; double; test/sim/fastPaths.test.ts compares them bit for bit. Layout (bytes; TRACED in
  ;; wasmTraced.ts holds the same numbers):
  ;;   589824  input chunk, f64 x 8192 each: x, input phase (cycles), frequency offset (Hz)
  ;;   786432  observation block k (k = 0 float loop, 1 bit-true loop) at 786432 + k*327680, f64 x 8192
  ;;           each: NCO phase (cycles), filter output, NCO frequency (Hz), smoothed unwrapped error,
  ;;           wrapped phase error (rad)
  ;;   1441792 accumulator state k at 1441792 + k*512: 20 f64 (runAccumulator.ts AccumulatorCore.state),
  ;;           then at +160 the boxcar's index, fill, length and address (i32 each); the bit-true
  ;;           conversion constants at 1442496 (5 f64), the quantiser's scale, min and max (f64) and
  ;;           rounding mode (i32) at 1442536
  ;;   1442816 float loop: constants and phase, waveform (1 square) and section count (i32) at +40 and +44,
  ;;           section state (4 x f64) at +64, coefficients (5 x f64) at +320
  ;;   1507328 the two ripple boxcars, f64 x up to 16384 each (their addresses in the state)
  ;;   1769600 lock band k at 1769600 + k*56: the open bucket's min and max, the tail sum, its end, width
  ;;           and place in its level, and the buckets the last bands closed (f64 each)
  ;;   559104  the buckets the last bands closed: min, max and end, f64 x 1280 each
  ;;   1835008 lock scratch k at 1835008 + k*65536, f64 x 8192: the phase error less the expected one
  ;;   1966080 input noise, f64 x 8192 (zero without noise)
  ;;   2031616 sin(2*pi*NCO phase) of the bit-true loop, f64 x 8192 (its quadrature arm)
  ;;   1769472 high words of n*pi/2 for the sine (below)
;;   1769728 the loops' f64 constants (the data segments at the end)

  ;; Samples i0 .. i1-1 of the chunk starting at sample n0 through accumulator k (runAccumulator.ts
  ;; pushChunk): unwrapped error, ripple boxcar, lock indicator, the min and max of the current bucket
  ;; of the four traces, and (flags) the tail and demodulation sums. The segment lies in one trace bucket.
  ;; With withFloat (k = 0) each sample first runs the float loop (floatKernel.ts runFloatChunk, and
  ;; ncoHz as simulate.ts has it) into observation block 0: its feedback chain (cosine, sections, phase)
  ;; leaves the core idle, and the accumulator's independent work fills those cycles; with makeInput
  ;; it also makes the input sample, which both loops read. Its cosine and the
  ;; quadrature arm's sine share one reduction (the module's sine below; the imported Math.cos and
  ;; Math.sin when $own is 0). The bit-true loop's quadrature sine comes precomputed (run).
  (func (export "accumulate") (param $k i32) (param $n0 i32) (param $i0 i32) (param $i1 i32) (param $tail i32) (param $demod i32) (param $withFloat i32) (param $own i32) (param $makeInput i32) (param $inputAmplitude f64)
    (local $st i32) (local $blk i32) (local $i i32) (local $o i32) (local $bp i32)
    (local $boxIndex i32) (local $boxFilled i32) (local $boxLength i32) (local $boxBase i32)
    (local $prev f64) (local $unwrapped f64) (local $boxSum f64) (local $lockState f64)
    (local $tailSum f64) (local $tailSum2 f64) (local $tailFreqSum f64) (local $demodSum2 f64)
    ;; the bucket's min and max of the phase and filter traces (lanes 0, 1) and of the frequency and lock traces
    (local $lo01 v128) (local $hi01 v128) (local $lo23 v128) (local $hi23 v128) (local $obs v128)
    (local $amplitude f64) (local $alpha f64) (local $centerHz f64) (local $gainHz f64)
    (local $phaseNco f64) (local $d f64) (local $e f64) (local $pe f64) (local $y f64) (local $hz f64) (local $off f64) (local $q f64)
    ;; the float loop's
    (local $fo i32) (local $fj i32) (local $fk i32) (local $fq i32) (local $fSections i32) (local $fSquare i32)
    (local $ph f64) (local $fc f64) (local $fv f64) (local $fx1 f64) (local $fy1 f64) (local $fy f64)
    (local $base f64) (local $gain f64) (local $fCenterHz f64) (local $fGainHz f64)
    ;; the float loop's cosine and sine (as in the sine function)
    (local $ta f64) (local $thx i32) (local $tix i32) (local $tn i32) (local $tj i32) (local $te i32) (local $tiy i32)
    (local $ty0 f64) (local $ty1 f64) (local $tt f64) (local $tfn f64) (local $tr f64) (local $tw f64) (local $tz f64)
    (local $tv f64) (local $tq f64) (local $tc f64) (local $ts f64)
    ;; the input sample's sine (makeInput)
    (local $ua f64) (local $us f64) (local $uhx i32) (local $uix i32) (local $un i32) (local $uj i32) (local $ue i32) (local $uiy i32)
    (local $uy0 f64) (local $uy1 f64) (local $ut f64) (local $ufn f64) (local $ur f64) (local $uw f64) (local $uz f64) (local $uv f64) (local $uq f64)
    ;; the constants from the pool (a literal in the loop would be rebuilt in a register at every use)
    (local $twoPi f64) (local $half f64) (local $minusHalf f64) (local $one f64) (local $minusOne f64) (local $two f64) (local $invpio2 f64) (local $pio2_1 f64)
    (local $pio2_1t f64) (local $pio2_2 f64) (local $pio2_2t f64) (local $pio2_3 f64) (local $pio2_3t f64) (local $S1 f64) (local $S2 f64) (local $S3 f64)
    (local $S4 f64) (local $S5 f64) (local $S6 f64) (local $C1 f64) (local $C2 f64) (local $C3 f64) (local $C4 f64) (local $C5 f64)
    (local $C6 f64) (local $qx f64)
    (local.set $twoPi (f64.load offset=1769728 (i32.const 0)))
    (local.set $half (f64.load offset=1769736 (i32.const 0)))
    (local.set $minusHalf (f64.load offset=1769744 (i32.const 0)))
    (local.set $one (f64.load offset=1769752 (i32.const 0)))
    (local.set $minusOne (f64.load offset=1769760 (i32.const 0)))
    (local.set $two (f64.load offset=1769768 (i32.const 0)))
    (local.set $invpio2 (f64.load offset=1769776 (i32.const 0)))
    (local.set $pio2_1 (f64.load offset=1769784 (i32.const 0)))
    (local.set $pio2_1t (f64.load offset=1769792 (i32.const 0)))
    (local.set $pio2_2 (f64.load offset=1769800 (i32.const 0)))
    (local.set $pio2_2t (f64.load offset=1769808 (i32.const 0)))
    (local.set $pio2_3 (f64.load offset=1769816 (i32.const 0)))
    (local.set $pio2_3t (f64.load offset=1769824 (i32.const 0)))
    (local.set $S1 (f64.load offset=1769832 (i32.const 0)))
    (local.set $S2 (f64.load offset=1769840 (i32.const 0)))
    (local.set $S3 (f64.load offset=1769848 (i32.const 0)))
    (local.set $S4 (f64.load offset=1769856 (i32.const 0)))
    (local.set $S5 (f64.load offset=1769864 (i32.const 0)))
    (local.set $S6 (f64.load offset=1769872 (i32.const 0)))
    (local.set $C1 (f64.load offset=1769880 (i32.const 0)))
    (local.set $C2 (f64.load offset=1769888 (i32.const 0)))
    (local.set $C3 (f64.load offset=1769896 (i32.const 0)))
    (local.set $C4 (f64.load offset=1769904 (i32.const 0)))
    (local.set $C5 (f64.load offset=1769912 (i32.const 0)))
    (local.set $C6 (f64.load offset=1769920 (i32.const 0)))
    (local.set $qx (f64.load offset=1769928 (i32.const 0)))
    (local.set $base (f64.load offset=1442816 (i32.const 0)))
    (local.set $gain (f64.load offset=1442824 (i32.const 0)))
    (local.set $fCenterHz (f64.load offset=1442832 (i32.const 0)))
    (local.set $fGainHz (f64.load offset=1442840 (i32.const 0)))
    (local.set $ph (f64.load offset=1442848 (i32.const 0)))
    (local.set $fSquare (i32.load offset=1442856 (i32.const 0)))
    (local.set $fSections (i32.load offset=1442860 (i32.const 0)))
    (local.set $st (i32.add (i32.const 1441792) (i32.mul (local.get $k) (i32.const 512))))
    (local.set $blk (i32.mul (local.get $k) (i32.const 327680)))
    (local.set $prev (f64.load offset=0 (local.get $st)))
    (local.set $unwrapped (f64.load offset=8 (local.get $st)))
    (local.set $boxSum (f64.load offset=16 (local.get $st)))
    (local.set $lockState (f64.load offset=24 (local.get $st)))
    (local.set $tailSum (f64.load offset=32 (local.get $st)))
    (local.set $tailSum2 (f64.load offset=40 (local.get $st)))
    (local.set $tailFreqSum (f64.load offset=48 (local.get $st)))
    (local.set $demodSum2 (f64.load offset=56 (local.get $st)))
    (local.set $lo01 (f64x2.replace_lane 1 (f64x2.splat (f64.load offset=64 (local.get $st))) (f64.load offset=80 (local.get $st))))
    (local.set $hi01 (f64x2.replace_lane 1 (f64x2.splat (f64.load offset=72 (local.get $st))) (f64.load offset=88 (local.get $st))))
    (local.set $lo23 (f64x2.replace_lane 1 (f64x2.splat (f64.load offset=96 (local.get $st))) (f64.load offset=112 (local.get $st))))
    (local.set $hi23 (f64x2.replace_lane 1 (f64x2.splat (f64.load offset=104 (local.get $st))) (f64.load offset=120 (local.get $st))))
    (local.set $amplitude (f64.load offset=128 (local.get $st)))
    (local.set $alpha (f64.load offset=136 (local.get $st)))
    (local.set $centerHz (f64.load offset=144 (local.get $st)))
    (local.set $gainHz (f64.load offset=152 (local.get $st)))
    (local.set $boxIndex (i32.load offset=160 (local.get $st)))
    (local.set $boxFilled (i32.load offset=164 (local.get $st)))
    (local.set $boxLength (i32.load offset=168 (local.get $st)))
    (local.set $boxBase (i32.load offset=172 (local.get $st)))
    (local.set $i (local.get $i0))
    (block $done
      (loop $sample
        (br_if $done (i32.ge_u (local.get $i) (local.get $i1)))
        (if (local.get $withFloat)
          (then
            (local.set $fo (i32.shl (local.get $i) (i32.const 3)))
            (if (local.get $makeInput)
              (then
                ;; this sample's input (inputSignal.ts: amplitude*sin(2*pi*phase) + noise) for both loops,
                ;; here where the feedback chain below leaves the core idle; the module's sine as in sine
                (local.set $ua (f64.mul (local.get $twoPi) (f64.load offset=655360 (local.get $fo))))
            (local.set $uhx (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $ua)) (i64.const 32))))
            (local.set $uix (i32.and (local.get $uhx) (i32.const 0x7fffffff)))
            (if (i32.or (i32.eqz (local.get $own)) (i32.gt_u (local.get $uix) (i32.const 0x413921fb)))
              (then (local.set $us (call $sin (local.get $ua))))
              (else
                ;; reduction: a = n*pi/2 + y0 + y1
                (if (i32.le_u (local.get $uix) (i32.const 0x3fe921fb))
                  (then
                    (local.set $uy0 (local.get $ua))
                    (local.set $uy1 (f64.const 0))
                    (local.set $un (i32.const 0))
                    (local.set $uiy (i32.const 0)))
                  (else
                    (local.set $uiy (i32.const 1))
                    (if (i32.lt_u (local.get $uix) (i32.const 0x4002d97c))
                      (then
                        ;; |a| < 3pi/4: n = +-1, pi/2 in 33 + 53 bits (33 + 33 + 53 next to pi/2 itself)
                        (if (i32.gt_s (local.get $uhx) (i32.const 0))
                          (then
                            (local.set $uz (f64.sub (local.get $ua) (local.get $pio2_1)))
                            (if (i32.ne (local.get $uix) (i32.const 0x3ff921fb))
                              (then
                                (local.set $uy0 (f64.sub (local.get $uz) (local.get $pio2_1t)))
                                (local.set $uy1 (f64.sub (f64.sub (local.get $uz) (local.get $uy0)) (local.get $pio2_1t))))
                              (else
                                (local.set $uz (f64.sub (local.get $uz) (local.get $pio2_2)))
                                (local.set $uy0 (f64.sub (local.get $uz) (local.get $pio2_2t)))
                                (local.set $uy1 (f64.sub (f64.sub (local.get $uz) (local.get $uy0)) (local.get $pio2_2t)))))
                            (local.set $un (i32.const 1)))
                          (else
                            (local.set $uz (f64.add (local.get $ua) (local.get $pio2_1)))
                            (if (i32.ne (local.get $uix) (i32.const 0x3ff921fb))
                              (then
                                (local.set $uy0 (f64.add (local.get $uz) (local.get $pio2_1t)))
                                (local.set $uy1 (f64.add (f64.sub (local.get $uz) (local.get $uy0)) (local.get $pio2_1t))))
                              (else
                                (local.set $uz (f64.add (local.get $uz) (local.get $pio2_2)))
                                (local.set $uy0 (f64.add (local.get $uz) (local.get $pio2_2t)))
                                (local.set $uy1 (f64.add (f64.sub (local.get $uz) (local.get $uy0)) (local.get $pio2_2t)))))
                            (local.set $un (i32.const -1)))))
                      (else
                        ;; n = round(|a|*2/pi); r - w good to 85 bits unless the high word says it may cancel
                        (local.set $ut (f64.abs (local.get $ua)))
                        (local.set $un (i32.trunc_f64_s (f64.add (f64.mul (local.get $ut) (local.get $invpio2)) (local.get $half))))
                        (local.set $ufn (f64.convert_i32_s (local.get $un)))
                        (local.set $ur (f64.sub (local.get $ut) (f64.mul (local.get $ufn) (local.get $pio2_1))))
                        (local.set $uw (f64.mul (local.get $ufn) (local.get $pio2_1t)))
                        (local.set $uy0 (f64.sub (local.get $ur) (local.get $uw)))
                        (if (i32.or (i32.ge_s (local.get $un) (i32.const 32))
                              (i32.eq (local.get $uix)
                                (i32.load offset=1769472 (i32.shl (select (i32.sub (local.get $un) (i32.const 1)) (i32.const 31) (i32.lt_s (local.get $un) (i32.const 32))) (i32.const 2)))))
                          (then
                            (local.set $uj (i32.shr_u (local.get $uix) (i32.const 20)))
                            (local.set $ue (i32.sub (local.get $uj)
                              (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $uy0)) (i64.const 52))) (i32.const 0x7ff))))
                            (if (i32.gt_s (local.get $ue) (i32.const 16))
                              (then
                                ;; second piece of pi/2, good to 118 bits
                                (local.set $ut (local.get $ur))
                                (local.set $uw (f64.mul (local.get $ufn) (local.get $pio2_2)))
                                (local.set $ur (f64.sub (local.get $ut) (local.get $uw)))
                                (local.set $uw (f64.sub (f64.mul (local.get $ufn) (local.get $pio2_2t))
                                  (f64.sub (f64.sub (local.get $ut) (local.get $ur)) (local.get $uw))))
                                (local.set $uy0 (f64.sub (local.get $ur) (local.get $uw)))
                                (local.set $ue (i32.sub (local.get $uj)
                                  (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $uy0)) (i64.const 52))) (i32.const 0x7ff))))
                                (if (i32.gt_s (local.get $ue) (i32.const 49))
                                  (then
                                    ;; third piece, good to 151 bits
                                    (local.set $ut (local.get $ur))
                                    (local.set $uw (f64.mul (local.get $ufn) (local.get $pio2_3)))
                                    (local.set $ur (f64.sub (local.get $ut) (local.get $uw)))
                                    (local.set $uw (f64.sub (f64.mul (local.get $ufn) (local.get $pio2_3t))
                                      (f64.sub (f64.sub (local.get $ut) (local.get $ur)) (local.get $uw))))
                                    (local.set $uy0 (f64.sub (local.get $ur) (local.get $uw)))))))))
                        (local.set $uy1 (f64.sub (f64.sub (local.get $ur) (local.get $uy0)) (local.get $uw)))
                        (if (i32.lt_s (local.get $uhx) (i32.const 0))
                          (then
                            (local.set $uy0 (f64.neg (local.get $uy0)))
                            (local.set $uy1 (f64.neg (local.get $uy1)))
                            (local.set $un (i32.sub (i32.const 0) (local.get $un)))))))))
                ;; kernels on [-pi/4, pi/4]: sin in quadrants 0 and 2, cos in 1 and 3, negated in 2 and 3
                (local.set $ue (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $uy0)) (i64.const 32))) (i32.const 0x7fffffff)))
                (local.set $uz (f64.mul (local.get $uy0) (local.get $uy0)))
                (if (i32.and (local.get $un) (i32.const 1))
                  (then
                    ;; cos(y0 + y1) = 1 - (z/2 - (z*r - y0*y1)), with 1 - qx split off above |y0| = 0.3
                    (if (i32.lt_u (local.get $ue) (i32.const 0x3e400000))
                      (then (local.set $us (local.get $one)))
                      (else
                        (local.set $uq (f64.mul (local.get $uz) (f64.add (local.get $C1) (f64.mul (local.get $uz)
                          (f64.add (local.get $C2) (f64.mul (local.get $uz) (f64.add (local.get $C3) (f64.mul (local.get $uz)
                          (f64.add (local.get $C4) (f64.mul (local.get $uz) (f64.add (local.get $C5)
                          (f64.mul (local.get $uz) (local.get $C6)))))))))))))
                        (if (i32.lt_u (local.get $ue) (i32.const 0x3fd33333))
                          (then
                            (local.set $us (f64.sub (local.get $one) (f64.sub (f64.mul (local.get $half) (local.get $uz))
                              (f64.sub (f64.mul (local.get $uz) (local.get $uq)) (f64.mul (local.get $uy0) (local.get $uy1)))))))
                          (else
                            (local.set $uv (select (local.get $qx)
                              (f64.reinterpret_i64 (i64.shl (i64.extend_i32_u (i32.sub (local.get $ue) (i32.const 0x00200000))) (i64.const 32)))
                              (i32.gt_u (local.get $ue) (i32.const 0x3fe90000))))
                            (local.set $us (f64.sub (f64.sub (local.get $one) (local.get $uv))
                              (f64.sub (f64.sub (f64.mul (local.get $half) (local.get $uz)) (local.get $uv))
                                (f64.sub (f64.mul (local.get $uz) (local.get $uq)) (f64.mul (local.get $uy0) (local.get $uy1)))))))))))
                  (else
                    ;; sin(y0 + y1) = y0 + (S1*y0^3 + (y0^2*(r*y0^3 - y1/2) + y1)), without y1 when not reduced
                    (if (i32.lt_u (local.get $ue) (i32.const 0x3e400000))
                      (then (local.set $us (local.get $uy0)))
                      (else
                        (local.set $uv (f64.mul (local.get $uz) (local.get $uy0)))
                        (local.set $uq (f64.add (local.get $S2) (f64.mul (local.get $uz)
                          (f64.add (local.get $S3) (f64.mul (local.get $uz) (f64.add (local.get $S4)
                          (f64.mul (local.get $uz) (f64.add (local.get $S5) (f64.mul (local.get $uz) (local.get $S6))))))))))
                        (local.set $us (if (result f64) (local.get $uiy)
                          (then (f64.sub (local.get $uy0) (f64.sub (f64.sub (f64.mul (local.get $uz)
                            (f64.sub (f64.mul (local.get $half) (local.get $uy1)) (f64.mul (local.get $uv) (local.get $uq))))
                            (local.get $uy1)) (f64.mul (local.get $uv) (local.get $S1)))))
                          (else (f64.add (local.get $uy0) (f64.mul (local.get $uv)
                            (f64.add (local.get $S1) (f64.mul (local.get $uz) (local.get $uq))))))))))))
                (if (i32.and (local.get $un) (i32.const 2)) (then (local.set $us (f64.neg (local.get $us)))))))
                (f64.store offset=589824 (local.get $fo)
                  (f64.add (f64.mul (local.get $inputAmplitude) (local.get $us)) (f64.load offset=1966080 (local.get $fo))))))
            ;; cos and sin of 2*pi*ph with one reduction (the module's sine, FD93), or the imported ones
            (local.set $ta (f64.mul (local.get $twoPi) (local.get $ph)))
            (local.set $thx (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $ta)) (i64.const 32))))
            (local.set $tix (i32.and (local.get $thx) (i32.const 0x7fffffff)))
            (if (i32.or (i32.eqz (local.get $own)) (i32.gt_u (local.get $tix) (i32.const 0x413921fb)))
              (then
                (local.set $tc (call $cos (local.get $ta)))
                (local.set $ts (call $sin (local.get $ta))))
              (else
                ;; reduction: a = n*pi/2 + y0 + y1
                (if (i32.le_u (local.get $tix) (i32.const 0x3fe921fb))
                  (then
                    (local.set $ty0 (local.get $ta))
                    (local.set $ty1 (f64.const 0))
                    (local.set $tn (i32.const 0))
                    (local.set $tiy (i32.const 0)))
                  (else
                    (local.set $tiy (i32.const 1))
                    (if (i32.lt_u (local.get $tix) (i32.const 0x4002d97c))
                      (then
                        ;; |a| < 3pi/4: n = +-1, pi/2 in 33 + 53 bits (33 + 33 + 53 next to pi/2 itself)
                        (if (i32.gt_s (local.get $thx) (i32.const 0))
                          (then
                            (local.set $tz (f64.sub (local.get $ta) (local.get $pio2_1)))
                            (if (i32.ne (local.get $tix) (i32.const 0x3ff921fb))
                              (then
                                (local.set $ty0 (f64.sub (local.get $tz) (local.get $pio2_1t)))
                                (local.set $ty1 (f64.sub (f64.sub (local.get $tz) (local.get $ty0)) (local.get $pio2_1t))))
                              (else
                                (local.set $tz (f64.sub (local.get $tz) (local.get $pio2_2)))
                                (local.set $ty0 (f64.sub (local.get $tz) (local.get $pio2_2t)))
                                (local.set $ty1 (f64.sub (f64.sub (local.get $tz) (local.get $ty0)) (local.get $pio2_2t)))))
                            (local.set $tn (i32.const 1)))
                          (else
                            (local.set $tz (f64.add (local.get $ta) (local.get $pio2_1)))
                            (if (i32.ne (local.get $tix) (i32.const 0x3ff921fb))
                              (then
                                (local.set $ty0 (f64.add (local.get $tz) (local.get $pio2_1t)))
                                (local.set $ty1 (f64.add (f64.sub (local.get $tz) (local.get $ty0)) (local.get $pio2_1t))))
                              (else
                                (local.set $tz (f64.add (local.get $tz) (local.get $pio2_2)))
                                (local.set $ty0 (f64.add (local.get $tz) (local.get $pio2_2t)))
                                (local.set $ty1 (f64.add (f64.sub (local.get $tz) (local.get $ty0)) (local.get $pio2_2t)))))
                            (local.set $tn (i32.const -1)))))
                      (else
                        ;; n = round(|a|*2/pi); r - w good to 85 bits unless the high word says it may cancel
                        (local.set $tt (f64.abs (local.get $ta)))
                        ;; fn as floor, n from it: the same integer as the int conversion and back, sooner
                        (local.set $tfn (f64.floor (f64.add (f64.mul (local.get $tt) (local.get $invpio2)) (local.get $half))))
                        (local.set $tn (i32.trunc_f64_s (local.get $tfn)))
                        (local.set $tr (f64.sub (local.get $tt) (f64.mul (local.get $tfn) (local.get $pio2_1))))
                        (local.set $tw (f64.mul (local.get $tfn) (local.get $pio2_1t)))
                        (local.set $ty0 (f64.sub (local.get $tr) (local.get $tw)))
                        (if (i32.or (i32.ge_s (local.get $tn) (i32.const 32))
                              (i32.eq (local.get $tix)
                                (i32.load offset=1769472 (i32.shl (select (i32.sub (local.get $tn) (i32.const 1)) (i32.const 31) (i32.lt_s (local.get $tn) (i32.const 32))) (i32.const 2)))))
                          (then
                            (local.set $tj (i32.shr_u (local.get $tix) (i32.const 20)))
                            (local.set $te (i32.sub (local.get $tj)
                              (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $ty0)) (i64.const 52))) (i32.const 0x7ff))))
                            (if (i32.gt_s (local.get $te) (i32.const 16))
                              (then
                                ;; second piece of pi/2, good to 118 bits
                                (local.set $tt (local.get $tr))
                                (local.set $tw (f64.mul (local.get $tfn) (local.get $pio2_2)))
                                (local.set $tr (f64.sub (local.get $tt) (local.get $tw)))
                                (local.set $tw (f64.sub (f64.mul (local.get $tfn) (local.get $pio2_2t))
                                  (f64.sub (f64.sub (local.get $tt) (local.get $tr)) (local.get $tw))))
                                (local.set $ty0 (f64.sub (local.get $tr) (local.get $tw)))
                                (local.set $te (i32.sub (local.get $tj)
                                  (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $ty0)) (i64.const 52))) (i32.const 0x7ff))))
                                (if (i32.gt_s (local.get $te) (i32.const 49))
                                  (then
                                    ;; third piece, good to 151 bits
                                    (local.set $tt (local.get $tr))
                                    (local.set $tw (f64.mul (local.get $tfn) (local.get $pio2_3)))
                                    (local.set $tr (f64.sub (local.get $tt) (local.get $tw)))
                                    (local.set $tw (f64.sub (f64.mul (local.get $tfn) (local.get $pio2_3t))
                                      (f64.sub (f64.sub (local.get $tt) (local.get $tr)) (local.get $tw))))
                                    (local.set $ty0 (f64.sub (local.get $tr) (local.get $tw)))))))))
                        (local.set $ty1 (f64.sub (f64.sub (local.get $tr) (local.get $ty0)) (local.get $tw)))
                        (if (i32.lt_s (local.get $thx) (i32.const 0))
                          (then
                            (local.set $ty0 (f64.neg (local.get $ty0)))
                            (local.set $ty1 (f64.neg (local.get $ty1)))
                            (local.set $tn (i32.sub (i32.const 0) (local.get $tn)))))))))
                ;; both kernels on [-pi/4, pi/4]: cos for the loop, sin for its quadrature arm
                (local.set $te (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $ty0)) (i64.const 32))) (i32.const 0x7fffffff)))
                (local.set $tz (f64.mul (local.get $ty0) (local.get $ty0)))
                (if (i32.lt_u (local.get $te) (i32.const 0x3e400000))
                  (then (local.set $tc (local.get $one)))
                  (else
                    (local.set $tq (f64.mul (local.get $tz) (f64.add (local.get $C1) (f64.mul (local.get $tz)
                      (f64.add (local.get $C2) (f64.mul (local.get $tz) (f64.add (local.get $C3) (f64.mul (local.get $tz)
                      (f64.add (local.get $C4) (f64.mul (local.get $tz) (f64.add (local.get $C5)
                      (f64.mul (local.get $tz) (local.get $C6)))))))))))))
                    (if (i32.lt_u (local.get $te) (i32.const 0x3fd33333))
                      (then
                        (local.set $tc (f64.sub (local.get $one) (f64.sub (f64.mul (local.get $half) (local.get $tz))
                          (f64.sub (f64.mul (local.get $tz) (local.get $tq)) (f64.mul (local.get $ty0) (local.get $ty1)))))))
                      (else
                        (local.set $tv (select (local.get $qx)
                          (f64.reinterpret_i64 (i64.shl (i64.extend_i32_u (i32.sub (local.get $te) (i32.const 0x00200000))) (i64.const 32)))
                          (i32.gt_u (local.get $te) (i32.const 0x3fe90000))))
                        (local.set $tc (f64.sub (f64.sub (local.get $one) (local.get $tv))
                          (f64.sub (f64.sub (f64.mul (local.get $half) (local.get $tz)) (local.get $tv))
                            (f64.sub (f64.mul (local.get $tz) (local.get $tq)) (f64.mul (local.get $ty0) (local.get $ty1))))))))))
                (if (i32.lt_u (local.get $te) (i32.const 0x3e400000))
                  (then (local.set $ts (local.get $ty0)))
                  (else
                    (local.set $tv (f64.mul (local.get $tz) (local.get $ty0)))
                    (local.set $tq (f64.add (local.get $S2) (f64.mul (local.get $tz)
                      (f64.add (local.get $S3) (f64.mul (local.get $tz) (f64.add (local.get $S4)
                      (f64.mul (local.get $tz) (f64.add (local.get $S5) (f64.mul (local.get $tz) (local.get $S6))))))))))
                    (local.set $ts (if (result f64) (local.get $tiy)
                      (then (f64.sub (local.get $ty0) (f64.sub (f64.sub (f64.mul (local.get $tz)
                        (f64.sub (f64.mul (local.get $half) (local.get $ty1)) (f64.mul (local.get $tv) (local.get $tq))))
                        (local.get $ty1)) (f64.mul (local.get $tv) (local.get $S1)))))
                      (else (f64.add (local.get $ty0) (f64.mul (local.get $tv)
                        (f64.add (local.get $S1) (f64.mul (local.get $tz) (local.get $tq))))))))))
                ;; quadrant n: cos is kc, -ks, -kc, ks and sin is ks, kc, -ks, -kc
                (local.set $tv (select (local.get $ts) (local.get $tc) (i32.and (local.get $tn) (i32.const 1))))
                (local.set $tq (select (local.get $tc) (local.get $ts) (i32.and (local.get $tn) (i32.const 1))))
                (local.set $tc (select (f64.neg (local.get $tv)) (local.get $tv) (i32.and (i32.add (local.get $tn) (i32.const 1)) (i32.const 2))))
                (local.set $ts (select (f64.neg (local.get $tq)) (local.get $tq) (i32.and (local.get $tn) (i32.const 2))))
              ))
            (local.set $fc (local.get $tc))
            (if (local.get $fSquare)
              (then (local.set $fc (select (local.get $one) (local.get $minusOne) (f64.ge (local.get $fc) (f64.const 0))))))
            (local.set $fv (f64.mul (f64.load offset=589824 (local.get $fo)) (local.get $fc)))
            (local.set $fj (i32.const 0))
            (local.set $fk (i32.const 1443136))
            (local.set $fq (i32.const 1442880))
            (block $fSectionsDone
              (loop $section
                (br_if $fSectionsDone (i32.ge_u (local.get $fj) (local.get $fSections)))
                (local.set $fx1 (f64.load offset=0 (local.get $fq)))
                (local.set $fy1 (f64.load offset=16 (local.get $fq)))
                ;; b0*v + b1*x1 + b2*x2 - a1*y1 - a2*y2, left to right
                (local.set $fy (f64.sub (f64.sub (f64.add (f64.add
                  (f64.mul (f64.load offset=0 (local.get $fk)) (local.get $fv))
                  (f64.mul (f64.load offset=8 (local.get $fk)) (local.get $fx1)))
                  (f64.mul (f64.load offset=16 (local.get $fk)) (f64.load offset=8 (local.get $fq))))
                  (f64.mul (f64.load offset=24 (local.get $fk)) (local.get $fy1)))
                  (f64.mul (f64.load offset=32 (local.get $fk)) (f64.load offset=24 (local.get $fq)))))
                (f64.store offset=8 (local.get $fq) (local.get $fx1))
                (f64.store offset=0 (local.get $fq) (local.get $fv))
                (f64.store offset=24 (local.get $fq) (local.get $fy1))
                (f64.store offset=16 (local.get $fq) (local.get $fy))
                (local.set $fv (local.get $fy))
                (local.set $fj (i32.add (local.get $fj) (i32.const 1)))
                (local.set $fk (i32.add (local.get $fk) (i32.const 40)))
                (local.set $fq (i32.add (local.get $fq) (i32.const 32)))
                (br $section)))
            (f64.store offset=786432 (local.get $fo) (local.get $ph))
            (f64.store offset=851968 (local.get $fo) (local.get $fv))
            (f64.store offset=917504 (local.get $fo) (f64.add (local.get $fCenterHz) (f64.mul (local.get $fGainHz) (local.get $fv))))
            (local.set $ph (f64.add (local.get $ph) (f64.add (local.get $base) (f64.mul (local.get $gain) (local.get $fv)))))
            ;; ph - floor(ph) only off (0, 1), where it is ph itself: the floor leaves the feedback chain
            (if (i32.eqz (i32.and (f64.gt (local.get $ph) (f64.const 0)) (f64.lt (local.get $ph) (local.get $one))))
              (then (local.set $ph (f64.sub (local.get $ph) (f64.floor (local.get $ph))))))))
        (local.set $o (i32.add (local.get $blk) (i32.shl (local.get $i) (i32.const 3))))
        (local.set $phaseNco (f64.load offset=786432 (local.get $o)))
        ;; e = d - round(d) for d in (-1, 1), written out as runAccumulator.ts has it (+ 0 turns -0 into +0)
        (local.set $d (f64.sub (f64.load offset=655360 (i32.shl (local.get $i) (i32.const 3))) (local.get $phaseNco)))
        (local.set $e (select (f64.sub (local.get $d) (local.get $one))
          (select (f64.add (local.get $d) (local.get $one)) (f64.add (local.get $d) (f64.const 0)) (f64.lt (local.get $d) (local.get $minusHalf)))
          (f64.ge (local.get $d) (local.get $half))))
        (local.set $d (f64.sub (local.get $e) (local.get $prev)))
        (local.set $d (select (f64.sub (local.get $d) (local.get $one))
          (select (f64.add (local.get $d) (local.get $one)) (f64.add (local.get $d) (f64.const 0)) (f64.lt (local.get $d) (local.get $minusHalf)))
          (f64.ge (local.get $d) (local.get $half))))
        (local.set $prev (local.get $e))
        (local.set $unwrapped (if (result f64) (i32.eqz (i32.add (local.get $n0) (local.get $i)))
          (then (f64.mul (local.get $e) (local.get $twoPi)))
          (else (f64.add (local.get $unwrapped) (f64.mul (local.get $d) (local.get $twoPi))))))
        (local.set $bp (i32.add (local.get $boxBase) (i32.shl (local.get $boxIndex) (i32.const 3))))
        (local.set $boxSum (f64.add (local.get $boxSum) (f64.sub (local.get $unwrapped) (f64.load (local.get $bp)))))
        (f64.store (local.get $bp) (local.get $unwrapped))
        (local.set $boxIndex (i32.add (local.get $boxIndex) (i32.const 1)))
        (if (i32.eq (local.get $boxIndex) (local.get $boxLength)) (then (local.set $boxIndex (i32.const 0))))
        (if (i32.lt_s (local.get $boxFilled) (local.get $boxLength)) (then (local.set $boxFilled (i32.add (local.get $boxFilled) (i32.const 1)))))
        (f64.store offset=983040 (local.get $o) (f64.div (local.get $boxSum) (f64.convert_i32_s (local.get $boxFilled))))
        ;; quadrature arm (2*x*sin(2*pi*phase))/A through the one-pole lock filter
        (local.set $q (f64.div
          (f64.mul (f64.mul (local.get $two) (f64.load offset=589824 (i32.shl (local.get $i) (i32.const 3))))
                   (if (result f64) (local.get $withFloat)
                     (then (local.get $ts))
                     (else (f64.load offset=2031616 (i32.shl (local.get $i) (i32.const 3))))))
          (local.get $amplitude)))
        (local.set $lockState (f64.add (local.get $lockState) (f64.mul (local.get $alpha) (f64.sub (local.get $q) (local.get $lockState)))))
        (local.set $pe (f64.mul (local.get $e) (local.get $twoPi)))
        (f64.store offset=1048576 (local.get $o) (local.get $pe))
        (local.set $y (f64.load offset=851968 (local.get $o)))
        (local.set $hz (f64.load offset=917504 (local.get $o)))
        ;; the bucket's min and max, compared in sample order as decimate.ts does, two traces a vector:
        ;; pmin(lo, v) is v < lo ? v : lo and pmax(hi, v) is hi < v ? v : hi (not f64.min: NaN, -0)
        (local.set $obs (f64x2.replace_lane 1 (f64x2.splat (local.get $pe)) (local.get $y)))
        (local.set $lo01 (f64x2.pmin (local.get $lo01) (local.get $obs)))
        (local.set $hi01 (f64x2.pmax (local.get $hi01) (local.get $obs)))
        (local.set $obs (f64x2.replace_lane 1 (f64x2.splat (local.get $hz)) (local.get $lockState)))
        (local.set $lo23 (f64x2.pmin (local.get $lo23) (local.get $obs)))
        (local.set $hi23 (f64x2.pmax (local.get $hi23) (local.get $obs)))
        (if (local.get $tail)
          (then
            (local.set $tailSum (f64.add (local.get $tailSum) (local.get $unwrapped)))
            (local.set $tailSum2 (f64.add (local.get $tailSum2) (f64.mul (local.get $unwrapped) (local.get $unwrapped))))
            (local.set $tailFreqSum (f64.add (local.get $tailFreqSum)
              (f64.sub (local.get $hz) (f64.add (local.get $centerHz) (f64.load offset=720896 (i32.shl (local.get $i) (i32.const 3)))))))))
        (if (local.get $demod)
          (then
            (local.set $d (f64.sub (f64.mul (local.get $y) (local.get $gainHz)) (f64.load offset=720896 (i32.shl (local.get $i) (i32.const 3)))))
            (local.set $demodSum2 (f64.add (local.get $demodSum2) (f64.mul (local.get $d) (local.get $d))))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $sample)))
    (if (local.get $withFloat) (then (f64.store offset=1442848 (i32.const 0) (local.get $ph))))
    (f64.store offset=0 (local.get $st) (local.get $prev))
    (f64.store offset=8 (local.get $st) (local.get $unwrapped))
    (f64.store offset=16 (local.get $st) (local.get $boxSum))
    (f64.store offset=24 (local.get $st) (local.get $lockState))
    (f64.store offset=32 (local.get $st) (local.get $tailSum))
    (f64.store offset=40 (local.get $st) (local.get $tailSum2))
    (f64.store offset=48 (local.get $st) (local.get $tailFreqSum))
    (f64.store offset=56 (local.get $st) (local.get $demodSum2))
    (f64.store offset=64 (local.get $st) (f64x2.extract_lane 0 (local.get $lo01)))
    (f64.store offset=72 (local.get $st) (f64x2.extract_lane 0 (local.get $hi01)))
    (f64.store offset=80 (local.get $st) (f64x2.extract_lane 1 (local.get $lo01)))
    (f64.store offset=88 (local.get $st) (f64x2.extract_lane 1 (local.get $hi01)))
    (f64.store offset=96 (local.get $st) (f64x2.extract_lane 0 (local.get $lo23)))
    (f64.store offset=104 (local.get $st) (f64x2.extract_lane 0 (local.get $hi23)))
    (f64.store offset=112 (local.get $st) (f64x2.extract_lane 1 (local.get $lo23)))
    (f64.store offset=120 (local.get $st) (f64x2.extract_lane 1 (local.get $hi23)))
    (i32.store offset=160 (local.get $st) (local.get $boxIndex))
    (i32.store offset=164 (local.get $st) (local.get $boxFilled)))

  ;; The lock test's buckets (lockMetric.ts LockTracker.pushRange and nextBucket) over the f64 values at
  ;; byte offset $src, samples i0 .. count-1 of the chunk from sample n0, with the open bucket's min, max,
  ;; end, width and place in its level as doubles at $slot (+0, +8, +24, +32, +40; the tail sum is +16):
  ;; min and max compared in sample order as pushRange does, a NaN anywhere making both NaN (the bucket
  ;; stays out of band); each bucket closed here goes to $out: its min, max and end (f64 each) in three
  ;; columns of $maxOut, their count to $slot + 48. Returns the sample it stopped at: count, or before the bucket
  ;; that found $out full.
  (func (export "bands") (param $src i32) (param $n0 i32) (param $i0 i32) (param $count i32) (param $slot i32)
    (param $out i32) (param $maxOut i32) (param $perLevel i32) (result i32)
    (local $i i32) (local $p i32) (local $stop i32) (local $v f64) (local $lo f64) (local $hi f64) (local $nan i32)
    ;; lo and hi in both lanes while a bucket fills (pmin and pmax: the comparisons of pushRange, branch-free)
    (local $vv v128) (local $lo2 v128) (local $hi2 v128)
    (local $bucketEnd i32) (local $width i32) (local $inLevel i32) (local $closed i32)
    (local.set $lo (f64.load offset=0 (local.get $slot)))
    (local.set $hi (f64.load offset=8 (local.get $slot)))
    (local.set $bucketEnd (i32.trunc_f64_s (f64.load offset=24 (local.get $slot))))
    (local.set $width (i32.trunc_f64_s (f64.load offset=32 (local.get $slot))))
    (local.set $inLevel (i32.trunc_f64_s (f64.load offset=40 (local.get $slot))))
    (local.set $i (local.get $i0))
    (block $done
      (loop $bucket
        (br_if $done (i32.ge_s (local.get $i) (local.get $count)))
        (if (i32.ge_s (i32.add (local.get $n0) (local.get $i)) (local.get $bucketEnd))
          (then
            ;; nextBucket: close the open one (if it has begun), then open the next on the grid
            (if (i32.gt_s (local.get $bucketEnd) (i32.const 0))
              (then
                (br_if $done (i32.ge_s (local.get $closed) (local.get $maxOut)))
                (local.set $p (i32.add (local.get $out) (i32.shl (local.get $closed) (i32.const 3))))
                (f64.store (local.get $p) (local.get $lo))
                (local.set $p (i32.add (local.get $p) (i32.shl (local.get $maxOut) (i32.const 3))))
                (f64.store (local.get $p) (local.get $hi))
                (local.set $p (i32.add (local.get $p) (i32.shl (local.get $maxOut) (i32.const 3))))
                (f64.store (local.get $p) (f64.convert_i32_s (local.get $bucketEnd)))
                (local.set $closed (i32.add (local.get $closed) (i32.const 1)))))
            (if (i32.eq (local.get $inLevel) (local.get $perLevel))
              (then
                (local.set $inLevel (i32.const 0))
                (local.set $width (i32.shl (local.get $width) (i32.const 1)))))
            (local.set $inLevel (i32.add (local.get $inLevel) (i32.const 1)))
            (local.set $bucketEnd (i32.add (local.get $bucketEnd) (local.get $width)))
            (local.set $lo (f64.const inf))
            (local.set $hi (f64.const -inf))))
        ;; the samples of this bucket in the chunk
        (local.set $stop (select (local.get $count) (i32.sub (local.get $bucketEnd) (local.get $n0))
          (i32.lt_s (local.get $count) (i32.sub (local.get $bucketEnd) (local.get $n0)))))
        (local.set $p (i32.add (local.get $src) (i32.shl (local.get $i) (i32.const 3))))
        (local.set $nan (i32.const 0))
        (local.set $lo2 (f64x2.splat (local.get $lo)))
        (local.set $hi2 (f64x2.splat (local.get $hi)))
        (block $filled
          (loop $sample
            (br_if $filled (i32.ge_s (local.get $i) (local.get $stop)))
            (local.set $v (f64.load (local.get $p)))
            (local.set $vv (f64x2.splat (local.get $v)))
            (local.set $lo2 (f64x2.pmin (local.get $lo2) (local.get $vv)))
            (local.set $hi2 (f64x2.pmax (local.get $hi2) (local.get $vv)))
            (local.set $nan (i32.or (local.get $nan) (f64.ne (local.get $v) (local.get $v))))
            (local.set $p (i32.add (local.get $p) (i32.const 8)))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            (br $sample)))
        (local.set $lo (f64x2.extract_lane 0 (local.get $lo2)))
        (local.set $hi (f64x2.extract_lane 0 (local.get $hi2)))
        (if (local.get $nan)
          (then (local.set $lo (f64.const nan)) (local.set $hi (f64.const nan))))
        (br $bucket)))
    (f64.store offset=0 (local.get $slot) (local.get $lo))
    (f64.store offset=8 (local.get $slot) (local.get $hi))
    (f64.store offset=24 (local.get $slot) (f64.convert_i32_s (local.get $bucketEnd)))
    (f64.store offset=32 (local.get $slot) (f64.convert_i32_s (local.get $width)))
    (f64.store offset=40 (local.get $slot) (f64.convert_i32_s (local.get $inLevel)))
    (f64.store offset=48 (local.get $slot) (f64.convert_i32_s (local.get $closed)))
    (local.get $i))

  ;; The running sum at $slot plus the f64 values at byte offset $src, samples i0 .. i1-1, in order
  ;; (the lock test's tail sum).
  (func (export "sum") (param $src i32) (param $i0 i32) (param $i1 i32) (param $slot i32)
    (local $p i32) (local $end i32) (local $s f64)
    (local.set $s (f64.load (local.get $slot)))
    (local.set $p (i32.add (local.get $src) (i32.shl (local.get $i0) (i32.const 3))))
    (local.set $end (i32.add (local.get $src) (i32.shl (local.get $i1) (i32.const 3))))
    (block $done
      (loop $sample
        (br_if $done (i32.ge_u (local.get $p) (local.get $end)))
        (local.set $s (f64.add (local.get $s) (f64.load (local.get $p))))
        (local.set $p (i32.add (local.get $p) (i32.const 8)))
        (br $sample)))
    (f64.store (local.get $slot) (local.get $s)))

  ;; ---- The engine's sine, in the module ----
  ;; Node's JavaScript engine computes Math.sin with fdlibm's algorithm (FD93: s_sin.c, k_sin.c,
  ;; k_cos.c, e_rem_pio2.c). Below is that algorithm operation for operation for |x| < 2^19*pi/2 (the
  ;; argument reduced by pi/2 in two or three pieces, then the kernel polynomials), and the imported
  ;; Math.sin beyond, so each value is the double Math.sin gives; inside a loop the core pipelines it,
  ;; where a call of the engine's C function costs a third more. wasmTraced.ts checks the engine's own
  ;; Math.sin against it on probe arguments before a run uses it.
  ;;
  ;;   Copyright (C) 1993 by Sun Microsystems, Inc. All rights reserved.
  ;;   Developed at SunSoft, a Sun Microsystems, Inc. business.
  ;;   Permission to use, copy, modify, and distribute this software is freely granted, provided
  ;;   that this notice is preserved.
  (data (i32.const 1769472)
    ;; high words of n*pi/2, n = 1 .. 32: an argument with the same high word may cancel in the reduction
    "\fb\21\f9\3f" "\fb\21\09\40" "\7c\d9\12\40" "\fb\21\19\40" "\7a\6a\1f\40" "\7c\d9\22\40" "\bb\fd\25\40" "\fb\21\29\40"
    "\3a\46\2c\40" "\7a\6a\2f\40" "\5c\47\31\40" "\7c\d9\32\40" "\9c\6b\34\40" "\bb\fd\35\40" "\db\8f\37\40" "\fb\21\39\40"
    "\1b\b4\3a\40" "\3a\46\3c\40" "\5a\d8\3d\40" "\7a\6a\3f\40" "\4c\7e\40\40" "\5c\47\41\40" "\6c\10\42\40" "\7c\d9\42\40"
    "\8c\a2\43\40" "\9c\6b\44\40" "\ac\34\45\40" "\bb\fd\45\40" "\cb\c6\46\40" "\db\8f\47\40" "\eb\58\48\40" "\fb\21\49\40")

  ;; dst[i] = sin(2*pi*src[i]) for i < count (byte offsets src, dst); with $affine, amplitude*that +
  ;; add[i] instead (the input: inputSignal.ts's amplitude*Math.sin(2*Math.PI*phase) + noise, noise 0
  ;; without any). $own 0 calls the imported Math.sin for every sample. With $cosine, cos instead: its
  ;; quadrant is one on (cos(x) is fdlibm's kernel choice for sin with n + 1), for wasmTraced.ts's probes
  ;; of the float loop's cosine.
  (func $sine (export "sine") (param $count i32) (param $src i32) (param $dst i32) (param $affine i32) (param $amplitude f64) (param $add i32) (param $own i32) (param $cosine i32)
    (local $i i32) (local $o i32) (local $a f64) (local $s f64)
    (local $hx i32) (local $ix i32) (local $n i32) (local $j i32) (local $e i32) (local $iy i32)
    (local $y0 f64) (local $y1 f64) (local $t f64) (local $fn f64) (local $r f64) (local $w f64) (local $z f64) (local $v f64) (local $q f64)
    ;; the constants from the pool (a literal in the loop would be rebuilt in a register at every use)
    (local $twoPi f64) (local $half f64) (local $one f64) (local $invpio2 f64) (local $pio2_1 f64) (local $pio2_1t f64) (local $pio2_2 f64) (local $pio2_2t f64)
    (local $pio2_3 f64) (local $pio2_3t f64) (local $S1 f64) (local $S2 f64) (local $S3 f64) (local $S4 f64) (local $S5 f64) (local $S6 f64)
    (local $C1 f64) (local $C2 f64) (local $C3 f64) (local $C4 f64) (local $C5 f64) (local $C6 f64) (local $qx f64)
    (local.set $twoPi (f64.load offset=1769728 (i32.const 0)))
    (local.set $half (f64.load offset=1769736 (i32.const 0)))
    (local.set $one (f64.load offset=1769752 (i32.const 0)))
    (local.set $invpio2 (f64.load offset=1769776 (i32.const 0)))
    (local.set $pio2_1 (f64.load offset=1769784 (i32.const 0)))
    (local.set $pio2_1t (f64.load offset=1769792 (i32.const 0)))
    (local.set $pio2_2 (f64.load offset=1769800 (i32.const 0)))
    (local.set $pio2_2t (f64.load offset=1769808 (i32.const 0)))
    (local.set $pio2_3 (f64.load offset=1769816 (i32.const 0)))
    (local.set $pio2_3t (f64.load offset=1769824 (i32.const 0)))
    (local.set $S1 (f64.load offset=1769832 (i32.const 0)))
    (local.set $S2 (f64.load offset=1769840 (i32.const 0)))
    (local.set $S3 (f64.load offset=1769848 (i32.const 0)))
    (local.set $S4 (f64.load offset=1769856 (i32.const 0)))
    (local.set $S5 (f64.load offset=1769864 (i32.const 0)))
    (local.set $S6 (f64.load offset=1769872 (i32.const 0)))
    (local.set $C1 (f64.load offset=1769880 (i32.const 0)))
    (local.set $C2 (f64.load offset=1769888 (i32.const 0)))
    (local.set $C3 (f64.load offset=1769896 (i32.const 0)))
    (local.set $C4 (f64.load offset=1769904 (i32.const 0)))
    (local.set $C5 (f64.load offset=1769912 (i32.const 0)))
    (local.set $C6 (f64.load offset=1769920 (i32.const 0)))
    (local.set $qx (f64.load offset=1769928 (i32.const 0)))
    (block $done
      (loop $sample
        (br_if $done (i32.ge_u (local.get $i) (local.get $count)))
        (local.set $o (i32.shl (local.get $i) (i32.const 3)))
        (local.set $a (f64.mul (local.get $twoPi) (f64.load (i32.add (local.get $src) (local.get $o)))))
        (local.set $hx (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $a)) (i64.const 32))))
        (local.set $ix (i32.and (local.get $hx) (i32.const 0x7fffffff)))
        (if (i32.or (i32.eqz (local.get $own)) (i32.gt_u (local.get $ix) (i32.const 0x413921fb)))
          (then (local.set $s (if (result f64) (local.get $cosine) (then (call $cos (local.get $a))) (else (call $sin (local.get $a))))))
          (else
            ;; reduction: a = n*pi/2 + y0 + y1
            (if (i32.le_u (local.get $ix) (i32.const 0x3fe921fb))
              (then
                (local.set $y0 (local.get $a))
                (local.set $y1 (f64.const 0))
                (local.set $n (i32.const 0))
                (local.set $iy (i32.const 0)))
              (else
                (local.set $iy (i32.const 1))
                (if (i32.lt_u (local.get $ix) (i32.const 0x4002d97c))
                  (then
                    ;; |a| < 3pi/4: n = +-1, pi/2 in 33 + 53 bits (33 + 33 + 53 next to pi/2 itself)
                    (if (i32.gt_s (local.get $hx) (i32.const 0))
                      (then
                        (local.set $z (f64.sub (local.get $a) (local.get $pio2_1)))
                        (if (i32.ne (local.get $ix) (i32.const 0x3ff921fb))
                          (then
                            (local.set $y0 (f64.sub (local.get $z) (local.get $pio2_1t)))
                            (local.set $y1 (f64.sub (f64.sub (local.get $z) (local.get $y0)) (local.get $pio2_1t))))
                          (else
                            (local.set $z (f64.sub (local.get $z) (local.get $pio2_2)))
                            (local.set $y0 (f64.sub (local.get $z) (local.get $pio2_2t)))
                            (local.set $y1 (f64.sub (f64.sub (local.get $z) (local.get $y0)) (local.get $pio2_2t)))))
                        (local.set $n (i32.const 1)))
                      (else
                        (local.set $z (f64.add (local.get $a) (local.get $pio2_1)))
                        (if (i32.ne (local.get $ix) (i32.const 0x3ff921fb))
                          (then
                            (local.set $y0 (f64.add (local.get $z) (local.get $pio2_1t)))
                            (local.set $y1 (f64.add (f64.sub (local.get $z) (local.get $y0)) (local.get $pio2_1t))))
                          (else
                            (local.set $z (f64.add (local.get $z) (local.get $pio2_2)))
                            (local.set $y0 (f64.add (local.get $z) (local.get $pio2_2t)))
                            (local.set $y1 (f64.add (f64.sub (local.get $z) (local.get $y0)) (local.get $pio2_2t)))))
                        (local.set $n (i32.const -1)))))
                  (else
                    ;; n = round(|a|*2/pi); r - w good to 85 bits unless the high word says it may cancel
                    (local.set $t (f64.abs (local.get $a)))
                    (local.set $n (i32.trunc_f64_s (f64.add (f64.mul (local.get $t) (local.get $invpio2)) (local.get $half))))
                    (local.set $fn (f64.convert_i32_s (local.get $n)))
                    (local.set $r (f64.sub (local.get $t) (f64.mul (local.get $fn) (local.get $pio2_1))))
                    (local.set $w (f64.mul (local.get $fn) (local.get $pio2_1t)))
                    (local.set $y0 (f64.sub (local.get $r) (local.get $w)))
                    (if (i32.or (i32.ge_s (local.get $n) (i32.const 32))
                          (i32.eq (local.get $ix)
                            (i32.load offset=1769472 (i32.shl (select (i32.sub (local.get $n) (i32.const 1)) (i32.const 31) (i32.lt_s (local.get $n) (i32.const 32))) (i32.const 2)))))
                      (then
                        (local.set $j (i32.shr_u (local.get $ix) (i32.const 20)))
                        (local.set $e (i32.sub (local.get $j)
                          (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $y0)) (i64.const 52))) (i32.const 0x7ff))))
                        (if (i32.gt_s (local.get $e) (i32.const 16))
                          (then
                            ;; second piece of pi/2, good to 118 bits
                            (local.set $t (local.get $r))
                            (local.set $w (f64.mul (local.get $fn) (local.get $pio2_2)))
                            (local.set $r (f64.sub (local.get $t) (local.get $w)))
                            (local.set $w (f64.sub (f64.mul (local.get $fn) (local.get $pio2_2t))
                              (f64.sub (f64.sub (local.get $t) (local.get $r)) (local.get $w))))
                            (local.set $y0 (f64.sub (local.get $r) (local.get $w)))
                            (local.set $e (i32.sub (local.get $j)
                              (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $y0)) (i64.const 52))) (i32.const 0x7ff))))
                            (if (i32.gt_s (local.get $e) (i32.const 49))
                              (then
                                ;; third piece, good to 151 bits
                                (local.set $t (local.get $r))
                                (local.set $w (f64.mul (local.get $fn) (local.get $pio2_3)))
                                (local.set $r (f64.sub (local.get $t) (local.get $w)))
                                (local.set $w (f64.sub (f64.mul (local.get $fn) (local.get $pio2_3t))
                                  (f64.sub (f64.sub (local.get $t) (local.get $r)) (local.get $w))))
                                (local.set $y0 (f64.sub (local.get $r) (local.get $w)))))))))
                    (local.set $y1 (f64.sub (f64.sub (local.get $r) (local.get $y0)) (local.get $w)))
                    (if (i32.lt_s (local.get $hx) (i32.const 0))
                      (then
                        (local.set $y0 (f64.neg (local.get $y0)))
                        (local.set $y1 (f64.neg (local.get $y1)))
                        (local.set $n (i32.sub (i32.const 0) (local.get $n)))))))))
            ;; kernels on [-pi/4, pi/4]: sin in quadrants 0 and 2, cos in 1 and 3, negated in 2 and 3
            (local.set $n (i32.add (local.get $n) (local.get $cosine)))
            (local.set $e (i32.and (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $y0)) (i64.const 32))) (i32.const 0x7fffffff)))
            (local.set $z (f64.mul (local.get $y0) (local.get $y0)))
            (if (i32.and (local.get $n) (i32.const 1))
              (then
                ;; cos(y0 + y1) = 1 - (z/2 - (z*r - y0*y1)), with 1 - qx split off above |y0| = 0.3
                (if (i32.lt_u (local.get $e) (i32.const 0x3e400000))
                  (then (local.set $s (local.get $one)))
                  (else
                    (local.set $q (f64.mul (local.get $z) (f64.add (local.get $C1) (f64.mul (local.get $z)
                      (f64.add (local.get $C2) (f64.mul (local.get $z) (f64.add (local.get $C3) (f64.mul (local.get $z)
                      (f64.add (local.get $C4) (f64.mul (local.get $z) (f64.add (local.get $C5)
                      (f64.mul (local.get $z) (local.get $C6)))))))))))))
                    (if (i32.lt_u (local.get $e) (i32.const 0x3fd33333))
                      (then
                        (local.set $s (f64.sub (local.get $one) (f64.sub (f64.mul (local.get $half) (local.get $z))
                          (f64.sub (f64.mul (local.get $z) (local.get $q)) (f64.mul (local.get $y0) (local.get $y1)))))))
                      (else
                        (local.set $v (select (local.get $qx)
                          (f64.reinterpret_i64 (i64.shl (i64.extend_i32_u (i32.sub (local.get $e) (i32.const 0x00200000))) (i64.const 32)))
                          (i32.gt_u (local.get $e) (i32.const 0x3fe90000))))
                        (local.set $s (f64.sub (f64.sub (local.get $one) (local.get $v))
                          (f64.sub (f64.sub (f64.mul (local.get $half) (local.get $z)) (local.get $v))
                            (f64.sub (f64.mul (local.get $z) (local.get $q)) (f64.mul (local.get $y0) (local.get $y1)))))))))))
              (else
                ;; sin(y0 + y1) = y0 + (S1*y0^3 + (y0^2*(r*y0^3 - y1/2) + y1)), without y1 when not reduced
                (if (i32.lt_u (local.get $e) (i32.const 0x3e400000))
                  (then (local.set $s (local.get $y0)))
                  (else
                    (local.set $v (f64.mul (local.get $z) (local.get $y0)))
                    (local.set $q (f64.add (local.get $S2) (f64.mul (local.get $z)
                      (f64.add (local.get $S3) (f64.mul (local.get $z) (f64.add (local.get $S4)
                      (f64.mul (local.get $z) (f64.add (local.get $S5) (f64.mul (local.get $z) (local.get $S6))))))))))
                    (local.set $s (if (result f64) (local.get $iy)
                      (then (f64.sub (local.get $y0) (f64.sub (f64.sub (f64.mul (local.get $z)
                        (f64.sub (f64.mul (local.get $half) (local.get $y1)) (f64.mul (local.get $v) (local.get $q))))
                        (local.get $y1)) (f64.mul (local.get $v) (local.get $S1)))))
                      (else (f64.add (local.get $y0) (f64.mul (local.get $v)
                        (f64.add (local.get $S1) (f64.mul (local.get $z) (local.get $q))))))))))))
            (if (i32.and (local.get $n) (i32.const 2)) (then (local.set $s (f64.neg (local.get $s)))))))
        (f64.store (i32.add (local.get $dst) (local.get $o))
          (if (result f64) (local.get $affine)
            (then (f64.add (f64.mul (local.get $amplitude) (local.get $s)) (f64.load (i32.add (local.get $add) (local.get $o)))))
            (else (local.get $s))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $sample))))

  ;; dst[i] = sin(2*pi*src[i]) for i < count (with $affine amplitude*that + add[i], as sine), two samples
  ;; a vector: the sine above lane by lane, the
  ;; same double operations on each lane (f64x2 arithmetic is IEEE per lane), for a pair whose two
  ;; arguments take the same path through it (the same reduction case and quadrant, neither argument
  ;; tiny); any other pair, an odd last sample, and every sample when $own is 0, go through the sine above.
  ;; Adjacent NCO phases differ by a small step, so nearly every pair qualifies.
  (func $sinePairs (export "sinePairs") (param $count i32) (param $src i32) (param $dst i32) (param $affine i32) (param $amplitude f64) (param $add i32) (param $own i32)
    (local $i i32) (local $o i32) (local $case0 i32) (local $case1 i32) (local $n i32) (local $iy i32)
    (local $hx i32) (local $ix0 i32) (local $ix1 i32) (local $e0 i32) (local $e1 i32) (local $bits v128)
    (local $a v128) (local $t v128) (local $fn v128) (local $r v128) (local $w v128) (local $y0 v128) (local $y1 v128)
    (local $z v128) (local $v v128) (local $q v128) (local $s v128)
    (local $twoPi v128) (local $half v128) (local $one v128) (local $invpio2 v128) (local $pio2_1 v128) (local $pio2_1t v128)
    (local $S1 v128) (local $S2 v128) (local $S3 v128) (local $S4 v128) (local $S5 v128) (local $S6 v128)
    (local $C1 v128) (local $C2 v128) (local $C3 v128) (local $C4 v128) (local $C5 v128) (local $C6 v128) (local $qx f64)
    (if (i32.eqz (local.get $own))
      (then
        (call $sine (local.get $count) (local.get $src) (local.get $dst) (local.get $affine) (local.get $amplitude) (local.get $add) (i32.const 0) (i32.const 0))
        (return)))
    (local.set $twoPi (v128.load64_splat offset=1769728 (i32.const 0)))
    (local.set $half (v128.load64_splat offset=1769736 (i32.const 0)))
    (local.set $one (v128.load64_splat offset=1769752 (i32.const 0)))
    (local.set $invpio2 (v128.load64_splat offset=1769776 (i32.const 0)))
    (local.set $pio2_1 (v128.load64_splat offset=1769784 (i32.const 0)))
    (local.set $pio2_1t (v128.load64_splat offset=1769792 (i32.const 0)))
    (local.set $S1 (v128.load64_splat offset=1769832 (i32.const 0)))
    (local.set $S2 (v128.load64_splat offset=1769840 (i32.const 0)))
    (local.set $S3 (v128.load64_splat offset=1769848 (i32.const 0)))
    (local.set $S4 (v128.load64_splat offset=1769856 (i32.const 0)))
    (local.set $S5 (v128.load64_splat offset=1769864 (i32.const 0)))
    (local.set $S6 (v128.load64_splat offset=1769872 (i32.const 0)))
    (local.set $C1 (v128.load64_splat offset=1769880 (i32.const 0)))
    (local.set $C2 (v128.load64_splat offset=1769888 (i32.const 0)))
    (local.set $C3 (v128.load64_splat offset=1769896 (i32.const 0)))
    (local.set $C4 (v128.load64_splat offset=1769904 (i32.const 0)))
    (local.set $C5 (v128.load64_splat offset=1769912 (i32.const 0)))
    (local.set $C6 (v128.load64_splat offset=1769920 (i32.const 0)))
    (local.set $qx (f64.load offset=1769928 (i32.const 0)))
    (block $done
      (loop $pair
        (br_if $done (i32.ge_u (i32.add (local.get $i) (i32.const 1)) (local.get $count)))
        (local.set $o (i32.shl (local.get $i) (i32.const 3)))
        (block $vector
          (block $scalar
            (local.set $a (f64x2.mul (local.get $twoPi) (v128.load (i32.add (local.get $src) (local.get $o)))))
            ;; the reduction case of each lane: 1 |a| <= pi/4, 2 pi/4 < a < 3pi/4 (not next to pi/2), 3 the
            ;; two-piece reduction of 3pi/4 <= a < 2^19*pi/2; 0 anything else (the scalar path)
            (local.set $hx (i32.wrap_i64 (i64.shr_u (i64x2.extract_lane 0 (local.get $a)) (i64.const 32))))
            (local.set $ix0 (i32.and (local.get $hx) (i32.const 0x7fffffff)))
            (local.set $case0
              (if (result i32) (i32.le_u (local.get $ix0) (i32.const 0x3fe921fb))
                (then (i32.const 1))
                (else (if (result i32) (i32.or (i32.le_s (local.get $hx) (i32.const 0)) (i32.gt_u (local.get $ix0) (i32.const 0x413921fb)))
                  (then (i32.const 0))
                  (else (if (result i32) (i32.lt_u (local.get $ix0) (i32.const 0x4002d97c))
                    (then (select (i32.const 2) (i32.const 0) (i32.ne (local.get $ix0) (i32.const 0x3ff921fb))))
                    (else (i32.const 3))))))))
            (local.set $hx (i32.wrap_i64 (i64.shr_u (i64x2.extract_lane 1 (local.get $a)) (i64.const 32))))
            (local.set $ix1 (i32.and (local.get $hx) (i32.const 0x7fffffff)))
            (local.set $case1
              (if (result i32) (i32.le_u (local.get $ix1) (i32.const 0x3fe921fb))
                (then (i32.const 1))
                (else (if (result i32) (i32.or (i32.le_s (local.get $hx) (i32.const 0)) (i32.gt_u (local.get $ix1) (i32.const 0x413921fb)))
                  (then (i32.const 0))
                  (else (if (result i32) (i32.lt_u (local.get $ix1) (i32.const 0x4002d97c))
                    (then (select (i32.const 2) (i32.const 0) (i32.ne (local.get $ix1) (i32.const 0x3ff921fb))))
                    (else (i32.const 3))))))))
            (br_if $scalar (i32.or (i32.eqz (local.get $case0)) (i32.ne (local.get $case0) (local.get $case1))))
            (if (i32.eq (local.get $case0) (i32.const 1))
              (then
                (local.set $y0 (local.get $a))
                (local.set $y1 (v128.const i64x2 0 0))
                (local.set $n (i32.const 0))
                (local.set $iy (i32.const 0)))
              (else
                (local.set $iy (i32.const 1))
                (if (i32.eq (local.get $case0) (i32.const 2))
                  (then
                    (local.set $z (f64x2.sub (local.get $a) (local.get $pio2_1)))
                    (local.set $y0 (f64x2.sub (local.get $z) (local.get $pio2_1t)))
                    (local.set $y1 (f64x2.sub (f64x2.sub (local.get $z) (local.get $y0)) (local.get $pio2_1t)))
                    (local.set $n (i32.const 1)))
                  (else
                    (local.set $t (f64x2.abs (local.get $a)))
                    ;; n = trunc(|a|*2/pi + 1/2) of each lane, as a double and (the same in both lanes) as an integer
                    (local.set $fn (f64x2.trunc (f64x2.add (f64x2.mul (local.get $t) (local.get $invpio2)) (local.get $half))))
                    (local.set $n (i32.trunc_f64_s (f64x2.extract_lane 0 (local.get $fn))))
                    (br_if $scalar (i32.ne (local.get $n) (i32.trunc_f64_s (f64x2.extract_lane 1 (local.get $fn)))))
                    ;; where the sine above takes a second piece of pi/2 (n >= 32 or the high word of n*pi/2)
                    (br_if $scalar (i32.ge_s (local.get $n) (i32.const 32)))
                    (br_if $scalar (i32.eq (local.get $ix0) (i32.load offset=1769472 (i32.shl (i32.sub (local.get $n) (i32.const 1)) (i32.const 2)))))
                    (br_if $scalar (i32.eq (local.get $ix1) (i32.load offset=1769472 (i32.shl (i32.sub (local.get $n) (i32.const 1)) (i32.const 2)))))
                    (local.set $r (f64x2.sub (local.get $t) (f64x2.mul (local.get $fn) (local.get $pio2_1))))
                    (local.set $w (f64x2.mul (local.get $fn) (local.get $pio2_1t)))
                    (local.set $y0 (f64x2.sub (local.get $r) (local.get $w)))
                    (local.set $y1 (f64x2.sub (f64x2.sub (local.get $r) (local.get $y0)) (local.get $w)))))))
            ;; kernels on [-pi/4, pi/4]; a tiny y0 in either lane takes the scalar path
            (local.set $e0 (i32.and (i32.wrap_i64 (i64.shr_u (i64x2.extract_lane 0 (local.get $y0)) (i64.const 32))) (i32.const 0x7fffffff)))
            (local.set $e1 (i32.and (i32.wrap_i64 (i64.shr_u (i64x2.extract_lane 1 (local.get $y0)) (i64.const 32))) (i32.const 0x7fffffff)))
            (br_if $scalar (i32.or (i32.lt_u (local.get $e0) (i32.const 0x3e400000)) (i32.lt_u (local.get $e1) (i32.const 0x3e400000))))
            (local.set $z (f64x2.mul (local.get $y0) (local.get $y0)))
            (if (i32.and (local.get $n) (i32.const 1))
              (then
                (local.set $q (f64x2.mul (local.get $z) (f64x2.add (local.get $C1) (f64x2.mul (local.get $z)
                  (f64x2.add (local.get $C2) (f64x2.mul (local.get $z) (f64x2.add (local.get $C3) (f64x2.mul (local.get $z)
                  (f64x2.add (local.get $C4) (f64x2.mul (local.get $z) (f64x2.add (local.get $C5)
                  (f64x2.mul (local.get $z) (local.get $C6)))))))))))))
                (if (i32.and (i32.lt_u (local.get $e0) (i32.const 0x3fd33333)) (i32.lt_u (local.get $e1) (i32.const 0x3fd33333)))
                  (then
                    (local.set $s (f64x2.sub (local.get $one) (f64x2.sub (f64x2.mul (local.get $half) (local.get $z))
                      (f64x2.sub (f64x2.mul (local.get $z) (local.get $q)) (f64x2.mul (local.get $y0) (local.get $y1)))))))
                  (else
                    (br_if $scalar (i32.or (i32.lt_u (local.get $e0) (i32.const 0x3fd33333)) (i32.lt_u (local.get $e1) (i32.const 0x3fd33333))))
                    (local.set $v (f64x2.replace_lane 1
                      (f64x2.splat (select (local.get $qx)
                        (f64.reinterpret_i64 (i64.shl (i64.extend_i32_u (i32.sub (local.get $e0) (i32.const 0x00200000))) (i64.const 32)))
                        (i32.gt_u (local.get $e0) (i32.const 0x3fe90000))))
                      (select (local.get $qx)
                        (f64.reinterpret_i64 (i64.shl (i64.extend_i32_u (i32.sub (local.get $e1) (i32.const 0x00200000))) (i64.const 32)))
                        (i32.gt_u (local.get $e1) (i32.const 0x3fe90000)))))
                    (local.set $s (f64x2.sub (f64x2.sub (local.get $one) (local.get $v))
                      (f64x2.sub (f64x2.sub (f64x2.mul (local.get $half) (local.get $z)) (local.get $v))
                        (f64x2.sub (f64x2.mul (local.get $z) (local.get $q)) (f64x2.mul (local.get $y0) (local.get $y1)))))))))
              (else
                (local.set $v (f64x2.mul (local.get $z) (local.get $y0)))
                (local.set $q (f64x2.add (local.get $S2) (f64x2.mul (local.get $z)
                  (f64x2.add (local.get $S3) (f64x2.mul (local.get $z) (f64x2.add (local.get $S4)
                  (f64x2.mul (local.get $z) (f64x2.add (local.get $S5) (f64x2.mul (local.get $z) (local.get $S6))))))))))
                (local.set $s (if (result v128) (local.get $iy)
                  (then (f64x2.sub (local.get $y0) (f64x2.sub (f64x2.sub (f64x2.mul (local.get $z)
                    (f64x2.sub (f64x2.mul (local.get $half) (local.get $y1)) (f64x2.mul (local.get $v) (local.get $q))))
                    (local.get $y1)) (f64x2.mul (local.get $v) (local.get $S1)))))
                  (else (f64x2.add (local.get $y0) (f64x2.mul (local.get $v)
                    (f64x2.add (local.get $S1) (f64x2.mul (local.get $z) (local.get $q))))))))))
            (if (i32.and (local.get $n) (i32.const 2)) (then (local.set $s (f64x2.neg (local.get $s)))))
            (if (local.get $affine)
              (then (local.set $s (f64x2.add (f64x2.mul (f64x2.splat (local.get $amplitude)) (local.get $s))
                (v128.load (i32.add (local.get $add) (local.get $o)))))))
            (v128.store (i32.add (local.get $dst) (local.get $o)) (local.get $s))
            (br $vector))
          (call $sine (i32.const 2) (i32.add (local.get $src) (local.get $o)) (i32.add (local.get $dst) (local.get $o))
            (local.get $affine) (local.get $amplitude) (i32.add (local.get $add) (local.get $o)) (i32.const 1) (i32.const 0)))
        (local.set $i (i32.add (local.get $i) (i32.const 2)))
        (br $pair)))
    (if (i32.lt_u (local.get $i) (local.get $count))
      (then
        (local.set $o (i32.shl (local.get $i) (i32.const 3)))
        (call $sine (i32.const 1) (i32.add (local.get $src) (local.get $o)) (i32.add (local.get $dst) (local.get $o))
          (local.get $affine) (local.get $amplitude) (i32.add (local.get $add) (local.get $o)) (i32.const 1) (i32.const 0)))))

  ;; The input phases of samples n0 .. n0+count-1 into the input chunk (inputSignal.ts advancePhases),
  ;; from $phase, reading the offsets already there: the phase step at sample $stepSample, then each
  ;; sample's phase before it advances by the constant step or by (centerHz + offset)/fs, wrapped
  ;; by phase - floor(phase) only off (0, 1). Returns the phase after the chunk.
  (func (export "phases") (param $count i32) (param $n0 i32) (param $phase f64) (param $constant i32) (param $constantStep f64)
    (param $centerHz f64) (param $sampleRateHz f64) (param $stepSample f64) (param $stepCycles f64) (result f64)
    (local $i i32) (local $o i32)
    ;; the constants from the pool (a literal in the loop would be rebuilt in a register at every use)
    (local $one f64)
    (local.set $one (f64.load offset=1769752 (i32.const 0)))
    (block $done
      (loop $sample
        (br_if $done (i32.ge_u (local.get $i) (local.get $count)))
        (local.set $o (i32.shl (local.get $i) (i32.const 3)))
        (if (f64.eq (f64.convert_i32_s (i32.add (local.get $n0) (local.get $i))) (local.get $stepSample))
          (then
            (local.set $phase (f64.add (local.get $phase) (local.get $stepCycles)))
            (local.set $phase (f64.sub (local.get $phase) (f64.floor (local.get $phase))))))
        (f64.store offset=655360 (local.get $o) (local.get $phase))
        (local.set $phase (f64.add (local.get $phase)
          (if (result f64) (local.get $constant)
            (then (local.get $constantStep))
            (else (f64.div (f64.add (local.get $centerHz) (f64.load offset=720896 (local.get $o))) (local.get $sampleRateHz))))))
        (if (i32.eqz (i32.and (f64.gt (local.get $phase) (f64.const 0)) (f64.lt (local.get $phase) (local.get $one))))
          (then (local.set $phase (f64.sub (local.get $phase) (f64.floor (local.get $phase))))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $sample)))
    (local.get $phase))
  ;; The f64 constants of the loops above, one a slot from 1769728 in the order of NAMES below: each loop reads them
  ;; into locals before it starts. V8 compiles a literal f64.const inside a loop to a register load of
  ;; its bits at each use (two or three instructions more); a local read from memory stays in a register
  ;; or its spill slot, which the arithmetic takes as an operand. The sine's names are fdlibm's (FD93).
  (data (i32.const 1769728) "\18\2d\44\54\fb\21\19\40") ;; twoPi = 6.283185307179586
  (data (i32.const 1769736) "\00\00\00\00\00\00\e0\3f") ;; half = 0.5
  (data (i32.const 1769744) "\00\00\00\00\00\00\e0\bf") ;; minusHalf = -0.5
  (data (i32.const 1769752) "\00\00\00\00\00\00\f0\3f") ;; one = 1
  (data (i32.const 1769760) "\00\00\00\00\00\00\f0\bf") ;; minusOne = -1
  (data (i32.const 1769768) "\00\00\00\00\00\00\00\40") ;; two = 2
  (data (i32.const 1769776) "\83\c8\c9\6d\30\5f\e4\3f") ;; invpio2 = 0x1.45f306dc9c883p-1
  (data (i32.const 1769784) "\00\00\40\54\fb\21\f9\3f") ;; pio2_1 = 0x1.921fb54400000p+0
  (data (i32.const 1769792) "\31\63\62\1a\61\b4\d0\3d") ;; pio2_1t = 0x1.0b4611a626331p-34
  (data (i32.const 1769800) "\00\00\60\1a\61\b4\d0\3d") ;; pio2_2 = 0x1.0b4611a600000p-34
  (data (i32.const 1769808) "\73\70\03\2e\8a\19\a3\3b") ;; pio2_2t = 0x1.3198a2e037073p-69
  (data (i32.const 1769816) "\00\00\00\2e\8a\19\a3\3b") ;; pio2_3 = 0x1.3198a2e000000p-69
  (data (i32.const 1769824) "\c1\49\20\25\9a\83\7b\39") ;; pio2_3t = 0x1.b839a252049c1p-104
  (data (i32.const 1769832) "\49\55\55\55\55\55\c5\bf") ;; S1 = -0x1.5555555555549p-3
  (data (i32.const 1769840) "\a6\f8\10\11\11\11\81\3f") ;; S2 = 0x1.111111110f8a6p-7
  (data (i32.const 1769848) "\d5\61\c1\19\a0\01\2a\bf") ;; S3 = -0x1.a01a019c161d5p-13
  (data (i32.const 1769856) "\7d\fe\b1\57\e3\1d\c7\3e") ;; S4 = 0x1.71de357b1fe7dp-19
  (data (i32.const 1769864) "\eb\9c\2b\8a\e6\e5\5a\be") ;; S5 = -0x1.ae5e68a2b9cebp-26
  (data (i32.const 1769872) "\7c\d5\cf\5a\3a\d9\e5\3d") ;; S6 = 0x1.5d93a5acfd57cp-33
  (data (i32.const 1769880) "\4c\55\55\55\55\55\a5\3f") ;; C1 = 0x1.555555555554cp-5
  (data (i32.const 1769888) "\77\51\c1\16\6c\c1\56\bf") ;; C2 = -0x1.6c16c16c15177p-10
  (data (i32.const 1769896) "\90\15\cb\19\a0\01\fa\3e") ;; C3 = 0x1.a01a019cb1590p-16
  (data (i32.const 1769904) "\ad\52\9c\80\4f\7e\92\be") ;; C4 = -0x1.27e4f809c52adp-22
  (data (i32.const 1769912) "\c4\b1\b4\bd\9e\ee\21\3e") ;; C5 = 0x1.1ee9ebdb4b1c4p-29
  (data (i32.const 1769920) "\d4\38\88\be\e9\fa\a8\bd") ;; C6 = -0x1.8fae9be8838d4p-37
  (data (i32.const 1769928) "\00\00\00\00\00\00\d2\3f") ;; qx = 0.28125
)
