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
;;   256    state: phase accumulator (i64), checksum (i32 in an i64 slot)
;;   512    section state, 4 x i64 per section: x[n-1], x[n-2], y[n-1], y[n-2]
;;   1024   coefficient codes, 5 x i64 per section: b0 b1 b2 a1 a2
;;   2048   sine table, i32 x 2^P (P <= 16)
;;   264192 input codes, i32 x 8192
;;   296960 outputs per sample, i32 x 8192 each: phase hi, phase lo, table address, NCO code,
;;          detector code, filter code; then the tuning increment as f64 x 8192 at 493568
(module
  (memory (export "memory") 9)
  (func (export "run") (param $count i32)
    (local $i i32) (local $o i32) (local $j i32) (local $k i32) (local $q i32)
    (local $addr i32) (local $c i32) (local $h i32)
    (local $acc i64) (local $x i64) (local $t i64) (local $u i64) (local $v i64) (local $a i64) (local $y i64)
    (local $x1 i64) (local $y1 i64)
    ;; constants
    (local $mode i32) (local $wrap i32) (local $macCheck i32) (local $sections i32) (local $square i32)
    (local $tableMask i32) (local $quarter i32) (local $halfTable i32) (local $fullScale i32)
    (local $dMax i64) (local $dMin i64) (local $dShift i64) (local $waMax i64) (local $waMin i64) (local $waShift i64)
    (local $phaseMask i64) (local $addrShift i64) (local $m i64) (local $g i64)
    ;; per rounding site: shift s, half h, and the mode that applies (0 when s = 0: no rounding)
    (local $detS i64) (local $detH i64) (local $detMode i32)
    (local $fcS i64) (local $fcH i64) (local $fcMode i32)
    (local $gS i64) (local $gH i64) (local $gMode i32) (local $gLeft i64)
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
    (local.set $acc (i64.load offset=256 (i32.const 0)))
    (local.set $h (i32.load offset=264 (i32.const 0)))
    (block $done
      (loop $sample
        (br_if $done (i32.ge_u (local.get $i) (local.get $count)))
        (local.set $o (i32.shl (local.get $i) (i32.const 2)))
        ;; table address: top P bits of the phase plus a quarter turn (the table then gives cos)
        (local.set $addr (i32.and
          (i32.add (i32.wrap_i64 (i64.shr_u (local.get $acc) (local.get $addrShift))) (local.get $quarter))
          (local.get $tableMask)))
        (local.set $c (if (result i32) (local.get $square)
          (then (select (local.get $fullScale) (i32.sub (i32.const 0) (local.get $fullScale))
                        (i32.lt_u (local.get $addr) (local.get $halfTable))))
          (else (i32.load offset=2048 (i32.shl (local.get $addr) (i32.const 2))))))
        ;; detector u = reduce_D(round_(B-1)(x*c))
        (local.set $x (i64.load32_s offset=264192 (local.get $o)))
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
        (i32.store offset=296960 (local.get $o) (i32.wrap_i64 (i64.shr_u (local.get $acc) (i64.const 32))))
        (i32.store offset=329728 (local.get $o) (i32.wrap_i64 (local.get $acc)))
        (i32.store offset=362496 (local.get $o) (local.get $addr))
        (i32.store offset=395264 (local.get $o) (local.get $c))
        (i32.store offset=428032 (local.get $o) (i32.wrap_i64 (local.get $u)))
        (i32.store offset=460800 (local.get $o) (i32.wrap_i64 (local.get $v)))
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
        (f64.store offset=493568 (i32.shl (local.get $i) (i32.const 3)) (f64.convert_i64_s (local.get $t)))
        (local.set $acc (i64.and (i64.add (i64.add (local.get $acc) (local.get $m)) (local.get $t)) (local.get $phaseMask)))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $sample)))
    (i64.store offset=256 (i32.const 0) (local.get $acc))
    (i32.store offset=264 (i32.const 0) (local.get $h))))
