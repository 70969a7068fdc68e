;; The analysis's frequency-grid passes as WebAssembly (gridKernel.ts loads it): the open loop sampled on a
;; grid, analog (analogLoopAt) or of digital sections (discreteSectionsAt), with its unwrapped phase
;; (samplePhase), all in analysis/response.ts and analysis/bode.ts. Each is the TypeScript's arithmetic,
;; operation for operation in the same order, on doubles (IEEE binary64 in both), and the arctangent is
;; the engine's own Math.atan2 (imported), so the same doubles; the TypeScript stays the reference and the
;; fallback (test/analysis/gridKernel.test.ts compares the two bit for bit).
;; Why: a first analysis in a fresh engine runs the 600-point passes before they are optimised, boxing
;; every double, while this code is compiled before its first point.
;;
;; Memory (bytes), for at most 256 coefficients, 128 polynomial lengths and 1024 grid points:
;;      0  coefficients: analog sections' numerators and denominators (highest power first), or
;;         b0 b1 b2 a0 a1 a2 of each digital section
;;   2048  polynomial lengths (i32): numerator, denominator of each analog section
;;   4096  grid frequencies (Hz)
;;  12288  cos ω, 20480 sin ω, 28672 cos 2ω, 36864 sin 2ω of each grid point (digital sections)
;;  45056  re, 53248 im of the sampled response, 61440 its unwrapped phase (degrees)
(module
  (import "math" "atan2" (func $atan2 (param f64 f64) (result f64)))
  (memory (export "memory") 2)

  ;; 1 when x is neither infinite nor NaN (Number.isFinite).
  (func $finite (param $x f64) (result i32)
    (f64.eq (f64.sub (local.get $x) (local.get $x)) (f64.const 0)))

  ;; analogLoopAt on every grid point: K·F(jω)/(jω), ω = twoPi·f, each polynomial by Horner's rule in jω
  ;; (analogProductAt), each quotient and product as multiplyByQuotient. Returns the first index whose
  ;; value is not finite, or -1.
  (func (export "analogFill") (param $sections i32) (param $n i32) (param $k f64) (param $twoPi f64) (result i32)
    (local $i i32) (local $s i32) (local $at i32) (local $end i32) (local $bad i32) (local $o i32)
    (local $w f64) (local $t f64) (local $nr f64) (local $ni f64) (local $dr f64) (local $di f64)
    (local $d f64) (local $qr f64) (local $qi f64) (local $hr f64) (local $hi f64) (local $x f64)
    (local $scale f64) (local $re f64) (local $im f64)
    (local.set $bad (i32.const -1))
    (block $done
      (loop $points
        (br_if $done (i32.ge_s (local.get $i) (local.get $n)))
        (local.set $o (i32.shl (local.get $i) (i32.const 3)))
        (local.set $w (f64.mul (local.get $twoPi) (f64.load offset=4096 (local.get $o))))
        (local.set $hr (f64.const 1))
        (local.set $hi (f64.const 0))
        (local.set $at (i32.const 0))
        (local.set $s (i32.const 0))
        (block $product
          (loop $section
            (br_if $product (i32.ge_s (local.get $s) (local.get $sections)))
            (local.set $nr (f64.const 0))
            (local.set $ni (f64.const 0))
            (local.set $end (i32.add (local.get $at) (i32.load offset=2048 (i32.shl (local.get $s) (i32.const 3)))))
            (block $numDone
              (loop $num
                (br_if $numDone (i32.ge_s (local.get $at) (local.get $end)))
                (local.set $t (f64.add (f64.mul (f64.neg (local.get $ni)) (local.get $w)) (f64.load (i32.shl (local.get $at) (i32.const 3)))))
                (local.set $ni (f64.mul (local.get $nr) (local.get $w)))
                (local.set $nr (local.get $t))
                (local.set $at (i32.add (local.get $at) (i32.const 1)))
                (br $num)))
            (local.set $dr (f64.const 0))
            (local.set $di (f64.const 0))
            (local.set $end (i32.add (local.get $at) (i32.load offset=2052 (i32.shl (local.get $s) (i32.const 3)))))
            (block $denDone
              (loop $den
                (br_if $denDone (i32.ge_s (local.get $at) (local.get $end)))
                (local.set $t (f64.add (f64.mul (f64.neg (local.get $di)) (local.get $w)) (f64.load (i32.shl (local.get $at) (i32.const 3)))))
                (local.set $di (f64.mul (local.get $dr) (local.get $w)))
                (local.set $dr (local.get $t))
                (local.set $at (i32.add (local.get $at) (i32.const 1)))
                (br $den)))
            ;; multiplyByQuotient
            (local.set $d (f64.add (f64.mul (local.get $dr) (local.get $dr)) (f64.mul (local.get $di) (local.get $di))))
            (local.set $qr (f64.div (f64.add (f64.mul (local.get $nr) (local.get $dr)) (f64.mul (local.get $ni) (local.get $di))) (local.get $d)))
            (local.set $qi (f64.div (f64.sub (f64.mul (local.get $ni) (local.get $dr)) (f64.mul (local.get $nr) (local.get $di))) (local.get $d)))
            (local.set $x (f64.sub (f64.mul (local.get $hr) (local.get $qr)) (f64.mul (local.get $hi) (local.get $qi))))
            (local.set $hi (f64.add (f64.mul (local.get $hr) (local.get $qi)) (f64.mul (local.get $hi) (local.get $qr))))
            (local.set $hr (local.get $x))
            (local.set $s (i32.add (local.get $s) (i32.const 1)))
            (br $section)))
        ;; cscale by K/ω, then divided by j
        (local.set $scale (f64.div (local.get $k) (local.get $w)))
        (local.set $re (f64.mul (local.get $hi) (local.get $scale)))
        (local.set $im (f64.neg (f64.mul (local.get $hr) (local.get $scale))))
        (f64.store offset=45056 (local.get $o) (local.get $re))
        (f64.store offset=53248 (local.get $o) (local.get $im))
        (if (i32.and (i32.lt_s (local.get $bad) (i32.const 0))
                     (i32.eqz (i32.and (call $finite (local.get $re)) (call $finite (local.get $im)))))
          (then (local.set $bad (local.get $i))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $points)))
    (local.get $bad))

  ;; discreteSectionsAt on every grid point: K·T/(z − 1) times the product of the sections' N/D at the
  ;; point's cos/sin (sectionsProductAt), quotients and products as cdiv and cmul. Returns the first index
  ;; whose value is not finite, or -1.
  (func (export "sectionsFill") (param $sections i32) (param $n i32) (param $kt f64) (result i32)
    (local $i i32) (local $c i32) (local $end i32) (local $bad i32) (local $o i32)
    (local $c1 f64) (local $s1 f64) (local $c2 f64) (local $s2 f64) (local $br f64) (local $bi f64)
    (local $ncoRe f64) (local $ncoIm f64) (local $nr f64) (local $ni f64) (local $dr f64) (local $di f64)
    (local $d f64) (local $qr f64) (local $qi f64) (local $hr f64) (local $hi f64) (local $x f64)
    (local $re f64) (local $im f64)
    (local.set $bad (i32.const -1))
    (local.set $end (i32.mul (local.get $sections) (i32.const 48)))
    (block $done
      (loop $points
        (br_if $done (i32.ge_s (local.get $i) (local.get $n)))
        (local.set $o (i32.shl (local.get $i) (i32.const 3)))
        (local.set $c1 (f64.load offset=12288 (local.get $o)))
        (local.set $s1 (f64.load offset=20480 (local.get $o)))
        (local.set $c2 (f64.load offset=28672 (local.get $o)))
        (local.set $s2 (f64.load offset=36864 (local.get $o)))
        ;; nco = kt/(z − 1): cdiv({kt, 0}, {c1 − 1, s1})
        (local.set $br (f64.sub (local.get $c1) (f64.const 1)))
        (local.set $bi (local.get $s1))
        (local.set $d (f64.add (f64.mul (local.get $br) (local.get $br)) (f64.mul (local.get $bi) (local.get $bi))))
        (local.set $ncoRe (f64.div (f64.add (f64.mul (local.get $kt) (local.get $br)) (f64.mul (f64.const 0) (local.get $bi))) (local.get $d)))
        (local.set $ncoIm (f64.div (f64.sub (f64.mul (f64.const 0) (local.get $br)) (f64.mul (local.get $kt) (local.get $bi))) (local.get $d)))
        (local.set $hr (f64.const 1))
        (local.set $hi (f64.const 0))
        (local.set $c (i32.const 0))
        (block $product
          (loop $section
            (br_if $product (i32.ge_s (local.get $c) (local.get $end)))
            (local.set $nr (f64.add (f64.add (f64.load (local.get $c)) (f64.mul (f64.load offset=8 (local.get $c)) (local.get $c1)))
                                    (f64.mul (f64.load offset=16 (local.get $c)) (local.get $c2))))
            (local.set $ni (f64.neg (f64.add (f64.mul (f64.load offset=8 (local.get $c)) (local.get $s1))
                                             (f64.mul (f64.load offset=16 (local.get $c)) (local.get $s2)))))
            (local.set $dr (f64.add (f64.add (f64.load offset=24 (local.get $c)) (f64.mul (f64.load offset=32 (local.get $c)) (local.get $c1)))
                                    (f64.mul (f64.load offset=40 (local.get $c)) (local.get $c2))))
            (local.set $di (f64.neg (f64.add (f64.mul (f64.load offset=32 (local.get $c)) (local.get $s1))
                                             (f64.mul (f64.load offset=40 (local.get $c)) (local.get $s2)))))
            ;; multiplyByQuotient
            (local.set $d (f64.add (f64.mul (local.get $dr) (local.get $dr)) (f64.mul (local.get $di) (local.get $di))))
            (local.set $qr (f64.div (f64.add (f64.mul (local.get $nr) (local.get $dr)) (f64.mul (local.get $ni) (local.get $di))) (local.get $d)))
            (local.set $qi (f64.div (f64.sub (f64.mul (local.get $ni) (local.get $dr)) (f64.mul (local.get $nr) (local.get $di))) (local.get $d)))
            (local.set $x (f64.sub (f64.mul (local.get $hr) (local.get $qr)) (f64.mul (local.get $hi) (local.get $qi))))
            (local.set $hi (f64.add (f64.mul (local.get $hr) (local.get $qi)) (f64.mul (local.get $hi) (local.get $qr))))
            (local.set $hr (local.get $x))
            (local.set $c (i32.add (local.get $c) (i32.const 48)))
            (br $section)))
        (local.set $re (f64.sub (f64.mul (local.get $ncoRe) (local.get $hr)) (f64.mul (local.get $ncoIm) (local.get $hi))))
        (local.set $im (f64.add (f64.mul (local.get $ncoRe) (local.get $hi)) (f64.mul (local.get $ncoIm) (local.get $hr))))
        (f64.store offset=45056 (local.get $o) (local.get $re))
        (f64.store offset=53248 (local.get $o) (local.get $im))
        (if (i32.and (i32.lt_s (local.get $bad) (i32.const 0))
                     (i32.eqz (i32.and (call $finite (local.get $re)) (call $finite (local.get $im)))))
          (then (local.set $bad (local.get $i))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $points)))
    (local.get $bad))

  ;; samplePhase's unwrapping from the first point's anchored phase: each later point adds the principal
  ;; angle of l_i/l_{i−1} in degrees (relativeAngleOfPartsDeg; 0 when that quotient's parts are both zero).
  (func (export "unwrapPhase") (param $n i32) (param $phase f64) (param $deg f64)
    (local $i i32) (local $o i32) (local $ar f64) (local $ai f64) (local $br f64) (local $bi f64)
    (local $re f64) (local $im f64) (local $angle f64)
    (f64.store offset=61440 (i32.const 0) (local.get $phase))
    (local.set $i (i32.const 1))
    (block $done
      (loop $points
        (br_if $done (i32.ge_s (local.get $i) (local.get $n)))
        (local.set $o (i32.shl (local.get $i) (i32.const 3)))
        (local.set $ar (f64.load offset=45056 (local.get $o)))
        (local.set $ai (f64.load offset=53248 (local.get $o)))
        (local.set $br (f64.load offset=45048 (local.get $o)))
        (local.set $bi (f64.load offset=53240 (local.get $o)))
        (local.set $re (f64.add (f64.mul (local.get $ar) (local.get $br)) (f64.mul (local.get $ai) (local.get $bi))))
        (local.set $im (f64.sub (f64.mul (local.get $ai) (local.get $br)) (f64.mul (local.get $ar) (local.get $bi))))
        (local.set $angle (f64.const 0))
        (if (i32.eqz (i32.and (f64.eq (local.get $re) (f64.const 0)) (f64.eq (local.get $im) (f64.const 0))))
          (then (local.set $angle (f64.mul (call $atan2 (local.get $im) (local.get $re)) (local.get $deg)))))
        (local.set $phase (f64.add (local.get $phase) (local.get $angle)))
        (f64.store offset=61440 (local.get $o) (local.get $phase))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $points)))))
