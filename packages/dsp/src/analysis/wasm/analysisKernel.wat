;; The long loops of the analysis as WebAssembly (analysisKernel.ts loads it): the free response of
;; the linearised loop behind impulseNorms (linearLoop.ts, runFreeResponse), the closed-loop step
;; responses (stepResponse.ts, runDiscreteSteps) and the matrix products of the noise Gramian
;; (linearLoop.ts, multiply). Each is the TypeScript loop's arithmetic, operation for operation in the
;; same order, on doubles (IEEE binary64 in both; the f64x2 lanes are two such doubles side by side), so
;; the same doubles; the TypeScript loops stay the reference (test/analysis/analysisKernel.test.ts
;; compares the two bit for bit).
;; Why: a first analysis in a fresh engine runs these loops before they are optimised, boxing every double,
;; while this code is compiled before its first sample.
;;
;; Memory (bytes, doubles), for at most 16 sections and 1024 kept samples:
;;     0  coefficients: b0 b1 b2 a1 a2 of each section (5 per section)
;;   640  section states: two per section
;;   896  l1, 1024 l2, 1152 block, 1280 prevBlock: one per section (freeResponse)
;;  2048  kept times, 10240 kept phase-step errors, 18432 kept frequency-step errors (discreteSteps)
;; 26624  step coefficients (5 per section), 27264 step states (2 per section), 27520 step outcome (i32),
;;        27528 the loop's six constants
;;        (freeResponseWithSteps)
;; 32768  matrices of the noise Gramian (multiply, gramian): 4096 doubles, as many n×n matrices as fit
(module
  (memory (export "memory") 1)

  ;; runFreeResponse: the sections' states y[n-1], y[n-2] at 640, sample 0's |h| in block and its square in l2;
  ;; returns the samples run, negated when the response had not died away by maxSamples.
  (func (export "freeResponse") (param $k i32) (param $kd f64) (param $koT f64) (param $theta f64) (param $u1 f64) (param $u2 f64) (param $maxSamples i32) (result i32)
    (local $peak f64) (local $samples i32) (local $done i32) (local $i i32) (local $j i32)
    (local $c i32) (local $s i32) (local $u f64) (local $v f64) (local $x1 f64) (local $x2 f64)
    (local $y f64) (local $y1 f64) (local $y2 f64) (local $h f64) (local $live f64)
    (local.set $j (i32.const 0))
    (block $peaked
      (loop $scan
        (br_if $peaked (i32.ge_s (local.get $j) (local.get $k)))
        (if (f64.gt (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))) (local.get $peak))
          (then (local.set $peak (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))))))
        (local.set $j (i32.add (local.get $j) (i32.const 1)))
        (br $scan)))
    (local.set $samples (i32.const 1))
    (block $finished
      (loop $blocks
        (local.set $i (i32.rem_u (local.get $samples) (i32.const 64)))
        (block $blockDone
          (loop $sample
            (br_if $blockDone (i32.ge_s (local.get $i) (i32.const 64)))
            (local.set $u (f64.mul (f64.neg (local.get $kd)) (local.get $theta)))
            (local.set $v (local.get $u))
            (local.set $x1 (local.get $u1))
            (local.set $x2 (local.get $u2))
            (local.set $j (i32.const 0))
            (block $sectionsDone
              (loop $section
                (br_if $sectionsDone (i32.ge_s (local.get $j) (local.get $k)))
                (local.set $c (i32.mul (local.get $j) (i32.const 40)))
                (local.set $s (i32.add (i32.const 640) (i32.shl (local.get $j) (i32.const 4))))
                (local.set $y1 (f64.load (local.get $s)))
                (local.set $y2 (f64.load offset=8 (local.get $s)))
                (local.set $y
                  (f64.sub
                    (f64.sub
                      (f64.add
                        (f64.add
                          (f64.mul (f64.load (local.get $c)) (local.get $v))
                          (f64.mul (f64.load offset=8 (local.get $c)) (local.get $x1)))
                        (f64.mul (f64.load offset=16 (local.get $c)) (local.get $x2)))
                      (f64.mul (f64.load offset=24 (local.get $c)) (local.get $y1)))
                    (f64.mul (f64.load offset=32 (local.get $c)) (local.get $y2))))
                (f64.store (local.get $s) (local.get $y))
                (f64.store offset=8 (local.get $s) (local.get $y1))
                (local.set $x1 (local.get $y1))
                (local.set $x2 (local.get $y2))
                (local.set $v (local.get $y))
                ;; y < 0 ? -y : y, as the TypeScript writes it (a −0 stays −0)
                (local.set $h (select (f64.neg (local.get $y)) (local.get $y) (f64.lt (local.get $y) (f64.const 0))))
                (f64.store offset=1152 (i32.shl (local.get $j) (i32.const 3))
                  (f64.add (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))) (local.get $h)))
                (f64.store offset=1024 (i32.shl (local.get $j) (i32.const 3))
                  (f64.add (f64.load offset=1024 (i32.shl (local.get $j) (i32.const 3))) (f64.mul (local.get $h) (local.get $h))))
                (if (f64.gt (local.get $h) (local.get $peak)) (then (local.set $peak (local.get $h))))
                (local.set $j (i32.add (local.get $j) (i32.const 1)))
                (br $section)))
            (local.set $u2 (local.get $u1))
            (local.set $u1 (local.get $u))
            (local.set $theta (f64.add (local.get $theta) (f64.mul (local.get $koT) (local.get $v))))
            (local.set $samples (i32.add (local.get $samples) (i32.const 1)))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            (br $sample)))
        (local.set $j (i32.const 0))
        (block $summed
          (loop $sum
            (br_if $summed (i32.ge_s (local.get $j) (local.get $k)))
            (f64.store offset=896 (i32.shl (local.get $j) (i32.const 3))
              (f64.add (f64.load offset=896 (i32.shl (local.get $j) (i32.const 3))) (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3)))))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $sum)))
        (local.set $live (f64.max (f64.max (f64.abs (local.get $theta)) (f64.abs (local.get $u1))) (f64.abs (local.get $u2))))
        (local.set $j (i32.const 0))
        (block $scanned
          (loop $states
            (br_if $scanned (i32.ge_s (local.get $j) (i32.shl (local.get $k) (i32.const 1))))
            (local.set $live (f64.max (local.get $live) (f64.abs (f64.load offset=640 (i32.shl (local.get $j) (i32.const 3))))))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $states)))
        (local.set $done (f64.lt (local.get $live) (f64.mul (f64.const 1e-8) (f64.max (local.get $peak) (f64.const 1e-300)))))
        (br_if $finished (i32.or (local.get $done) (i32.ge_s (local.get $samples) (local.get $maxSamples))))
        (local.set $j (i32.const 0))
        (block $moved
          (loop $move
            (br_if $moved (i32.ge_s (local.get $j) (local.get $k)))
            (f64.store offset=1280 (i32.shl (local.get $j) (i32.const 3)) (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))))
            (f64.store offset=1152 (i32.shl (local.get $j) (i32.const 3)) (f64.const 0))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $move)))
        (br $blocks)))
    (select (local.get $samples) (i32.sub (i32.const 0) (local.get $samples)) (local.get $done)))

  ;; freeResponse and discreteSteps in one loop: the step run's sample beside each free-response sample,
  ;; then its rest alone. Each recursion waits on its own chain of dependent additions, so the processor
  ;; runs the two side by side in about the time of the longer; each keeps its own operations in their
  ;; order (the same doubles as either run alone). The step run's coefficients at 26624, its states at
  ;; 27264 (zeroed by the caller), its outcome (discreteSteps's return value) left at 27520.
  (func (export "freeResponseWithSteps") (param $k i32) (param $kd f64) (param $koT f64) (param $theta f64) (param $u1 f64) (param $u2 f64) (param $maxSamples i32)
    (param $ks i32) (param $kt f64) (param $t f64) (param $twoPiT f64) (param $n i32) (param $stride i32) (param $divergedRad f64) (result i32)
    (local $stepsLive i32) (local $stepResult i32) (local $si i32) (local $untilKept i32) (local $kept i32) (local $sj i32) (local $sc i32) (local $ss i32)
    (local $thetaO f64) (local $before f64) (local $e f64) (local $f f64) (local $x f64) (local $sy f64)
    (local $peak f64) (local $samples i32) (local $done i32) (local $i i32) (local $j i32)
    (local $c i32) (local $s i32) (local $u f64) (local $v f64) (local $x1 f64) (local $x2 f64)
    (local $y f64) (local $y1 f64) (local $y2 f64) (local $h f64) (local $live f64)
    ;; the loop's constants in memory, read where used: held in registers with both loops' values, they
    ;; left too few for the two recursions, which then waited on the stack
    (f64.store offset=27528 (i32.const 0) (local.get $kd))
    (f64.store offset=27536 (i32.const 0) (local.get $koT))
    (f64.store offset=27544 (i32.const 0) (local.get $kt))
    (f64.store offset=27552 (i32.const 0) (local.get $t))
    (f64.store offset=27560 (i32.const 0) (local.get $twoPiT))
    (f64.store offset=27568 (i32.const 0) (local.get $divergedRad))
    (local.set $stepsLive (i32.const 1))
    (local.set $j (i32.const 0))
    (block $peaked
      (loop $scan
        (br_if $peaked (i32.ge_s (local.get $j) (local.get $k)))
        (if (f64.gt (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))) (local.get $peak))
          (then (local.set $peak (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))))))
        (local.set $j (i32.add (local.get $j) (i32.const 1)))
        (br $scan)))
    (local.set $samples (i32.const 1))
    (block $finished
      (loop $blocks
        (local.set $i (i32.rem_u (local.get $samples) (i32.const 64)))
        (block $blockDone
          (loop $sample
            (br_if $blockDone (i32.ge_s (local.get $i) (i32.const 64)))
            (local.set $u (f64.mul (f64.neg (f64.load offset=27528 (i32.const 0))) (local.get $theta)))
            (local.set $v (local.get $u))
            (local.set $x1 (local.get $u1))
            (local.set $x2 (local.get $u2))
            (local.set $j (i32.const 0))
            (block $sectionsDone
              (loop $section
                (br_if $sectionsDone (i32.ge_s (local.get $j) (local.get $k)))
                (local.set $c (i32.mul (local.get $j) (i32.const 40)))
                (local.set $s (i32.add (i32.const 640) (i32.shl (local.get $j) (i32.const 4))))
                (local.set $y1 (f64.load (local.get $s)))
                (local.set $y2 (f64.load offset=8 (local.get $s)))
                (local.set $y
                  (f64.sub
                    (f64.sub
                      (f64.add
                        (f64.add
                          (f64.mul (f64.load (local.get $c)) (local.get $v))
                          (f64.mul (f64.load offset=8 (local.get $c)) (local.get $x1)))
                        (f64.mul (f64.load offset=16 (local.get $c)) (local.get $x2)))
                      (f64.mul (f64.load offset=24 (local.get $c)) (local.get $y1)))
                    (f64.mul (f64.load offset=32 (local.get $c)) (local.get $y2))))
                (f64.store (local.get $s) (local.get $y))
                (f64.store offset=8 (local.get $s) (local.get $y1))
                (local.set $x1 (local.get $y1))
                (local.set $x2 (local.get $y2))
                (local.set $v (local.get $y))
                ;; y < 0 ? -y : y, as the TypeScript writes it (a −0 stays −0)
                (local.set $h (select (f64.neg (local.get $y)) (local.get $y) (f64.lt (local.get $y) (f64.const 0))))
                (f64.store offset=1152 (i32.shl (local.get $j) (i32.const 3))
                  (f64.add (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))) (local.get $h)))
                (f64.store offset=1024 (i32.shl (local.get $j) (i32.const 3))
                  (f64.add (f64.load offset=1024 (i32.shl (local.get $j) (i32.const 3))) (f64.mul (local.get $h) (local.get $h))))
                (if (f64.gt (local.get $h) (local.get $peak)) (then (local.set $peak (local.get $h))))
                (local.set $j (i32.add (local.get $j) (i32.const 1)))
                (br $section)))
            (local.set $u2 (local.get $u1))
            (local.set $u1 (local.get $u))
            (local.set $theta (f64.add (local.get $theta) (f64.mul (f64.load offset=27536 (i32.const 0)) (local.get $v))))
            (local.set $samples (i32.add (local.get $samples) (i32.const 1)))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            ;; one sample of the step responses (runDiscreteSteps), while they run
            (if (local.get $stepsLive)
              (then
                (if (i32.ge_s (local.get $si) (local.get $n))
                  (then
                    (local.set $stepsLive (i32.const 0))
                    (local.set $stepResult (local.get $kept)))
                  (else
                    (local.set $e (f64.sub (f64.const 1) (local.get $thetaO)))
                    (local.set $f (f64.mul (f64.load offset=27560 (i32.const 0)) (local.get $before)))
                    (local.set $before (f64.add (local.get $before) (local.get $e)))
                    (if (i32.eqz (i32.and (f64.lt (f64.abs (local.get $f)) (f64.load offset=27568 (i32.const 0))) (f64.lt (f64.abs (local.get $e)) (f64.load offset=27568 (i32.const 0)))))
                      (then
                        (local.set $stepsLive (i32.const 0))
                        (local.set $stepResult (i32.sub (i32.const -1) (local.get $kept))))
                      (else
                        (if (i32.eqz (local.get $untilKept))
                          (then
                            (local.set $untilKept (local.get $stride))
                            (f64.store offset=2048 (i32.shl (local.get $kept) (i32.const 3)) (f64.mul (f64.convert_i32_s (local.get $si)) (f64.load offset=27552 (i32.const 0))))
                            (f64.store offset=10240 (i32.shl (local.get $kept) (i32.const 3)) (local.get $e))
                            (f64.store offset=18432 (i32.shl (local.get $kept) (i32.const 3)) (local.get $f))
                            (local.set $kept (i32.add (local.get $kept) (i32.const 1)))))
                        (local.set $x (local.get $e))
                        (local.set $sj (i32.const 0))
                        (block $stepSectionsDone
                          (loop $stepSection
                            (br_if $stepSectionsDone (i32.ge_s (local.get $sj) (local.get $ks)))
                            (local.set $sc (i32.add (i32.const 26624) (i32.mul (local.get $sj) (i32.const 40))))
                            (local.set $ss (i32.add (i32.const 27264) (i32.shl (local.get $sj) (i32.const 4))))
                            (local.set $sy (f64.add (f64.mul (f64.load (local.get $sc)) (local.get $x)) (f64.load (local.get $ss))))
                            (f64.store (local.get $ss)
                              (f64.add
                                (f64.sub (f64.mul (f64.load offset=8 (local.get $sc)) (local.get $x)) (f64.mul (f64.load offset=24 (local.get $sc)) (local.get $sy)))
                                (f64.load offset=8 (local.get $ss))))
                            (f64.store offset=8 (local.get $ss)
                              (f64.sub (f64.mul (f64.load offset=16 (local.get $sc)) (local.get $x)) (f64.mul (f64.load offset=32 (local.get $sc)) (local.get $sy))))
                            (local.set $x (local.get $sy))
                            (local.set $sj (i32.add (local.get $sj) (i32.const 1)))
                            (br $stepSection)))
                        (local.set $thetaO (f64.add (local.get $thetaO) (f64.mul (f64.load offset=27544 (i32.const 0)) (local.get $x))))
                        (local.set $si (i32.add (local.get $si) (i32.const 1)))
                        (local.set $untilKept (i32.sub (local.get $untilKept) (i32.const 1)))))))))
            (br $sample)))
        (local.set $j (i32.const 0))
        (block $summed
          (loop $sum
            (br_if $summed (i32.ge_s (local.get $j) (local.get $k)))
            (f64.store offset=896 (i32.shl (local.get $j) (i32.const 3))
              (f64.add (f64.load offset=896 (i32.shl (local.get $j) (i32.const 3))) (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3)))))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $sum)))
        (local.set $live (f64.max (f64.max (f64.abs (local.get $theta)) (f64.abs (local.get $u1))) (f64.abs (local.get $u2))))
        (local.set $j (i32.const 0))
        (block $scanned
          (loop $states
            (br_if $scanned (i32.ge_s (local.get $j) (i32.shl (local.get $k) (i32.const 1))))
            (local.set $live (f64.max (local.get $live) (f64.abs (f64.load offset=640 (i32.shl (local.get $j) (i32.const 3))))))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $states)))
        (local.set $done (f64.lt (local.get $live) (f64.mul (f64.const 1e-8) (f64.max (local.get $peak) (f64.const 1e-300)))))
        (br_if $finished (i32.or (local.get $done) (i32.ge_s (local.get $samples) (local.get $maxSamples))))
        (local.set $j (i32.const 0))
        (block $moved
          (loop $move
            (br_if $moved (i32.ge_s (local.get $j) (local.get $k)))
            (f64.store offset=1280 (i32.shl (local.get $j) (i32.const 3)) (f64.load offset=1152 (i32.shl (local.get $j) (i32.const 3))))
            (f64.store offset=1152 (i32.shl (local.get $j) (i32.const 3)) (f64.const 0))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $move)))
        (br $blocks)))
    ;; the step run's samples left after the free response ended
    (block $stepsDone
      (loop $stepsRest
        (br_if $stepsDone (i32.eqz (local.get $stepsLive)))
            ;; one sample of the step responses (runDiscreteSteps), while they run
            (if (local.get $stepsLive)
              (then
                (if (i32.ge_s (local.get $si) (local.get $n))
                  (then
                    (local.set $stepsLive (i32.const 0))
                    (local.set $stepResult (local.get $kept)))
                  (else
                    (local.set $e (f64.sub (f64.const 1) (local.get $thetaO)))
                    (local.set $f (f64.mul (f64.load offset=27560 (i32.const 0)) (local.get $before)))
                    (local.set $before (f64.add (local.get $before) (local.get $e)))
                    (if (i32.eqz (i32.and (f64.lt (f64.abs (local.get $f)) (f64.load offset=27568 (i32.const 0))) (f64.lt (f64.abs (local.get $e)) (f64.load offset=27568 (i32.const 0)))))
                      (then
                        (local.set $stepsLive (i32.const 0))
                        (local.set $stepResult (i32.sub (i32.const -1) (local.get $kept))))
                      (else
                        (if (i32.eqz (local.get $untilKept))
                          (then
                            (local.set $untilKept (local.get $stride))
                            (f64.store offset=2048 (i32.shl (local.get $kept) (i32.const 3)) (f64.mul (f64.convert_i32_s (local.get $si)) (f64.load offset=27552 (i32.const 0))))
                            (f64.store offset=10240 (i32.shl (local.get $kept) (i32.const 3)) (local.get $e))
                            (f64.store offset=18432 (i32.shl (local.get $kept) (i32.const 3)) (local.get $f))
                            (local.set $kept (i32.add (local.get $kept) (i32.const 1)))))
                        (local.set $x (local.get $e))
                        (local.set $sj (i32.const 0))
                        (block $stepSectionsDone
                          (loop $stepSection
                            (br_if $stepSectionsDone (i32.ge_s (local.get $sj) (local.get $ks)))
                            (local.set $sc (i32.add (i32.const 26624) (i32.mul (local.get $sj) (i32.const 40))))
                            (local.set $ss (i32.add (i32.const 27264) (i32.shl (local.get $sj) (i32.const 4))))
                            (local.set $sy (f64.add (f64.mul (f64.load (local.get $sc)) (local.get $x)) (f64.load (local.get $ss))))
                            (f64.store (local.get $ss)
                              (f64.add
                                (f64.sub (f64.mul (f64.load offset=8 (local.get $sc)) (local.get $x)) (f64.mul (f64.load offset=24 (local.get $sc)) (local.get $sy)))
                                (f64.load offset=8 (local.get $ss))))
                            (f64.store offset=8 (local.get $ss)
                              (f64.sub (f64.mul (f64.load offset=16 (local.get $sc)) (local.get $x)) (f64.mul (f64.load offset=32 (local.get $sc)) (local.get $sy))))
                            (local.set $x (local.get $sy))
                            (local.set $sj (i32.add (local.get $sj) (i32.const 1)))
                            (br $stepSection)))
                        (local.set $thetaO (f64.add (local.get $thetaO) (f64.mul (f64.load offset=27544 (i32.const 0)) (local.get $x))))
                        (local.set $si (i32.add (local.get $si) (i32.const 1)))
                        (local.set $untilKept (i32.sub (local.get $untilKept) (i32.const 1)))))))))
        (br $stepsRest)))
    (i32.store offset=27520 (i32.const 0) (local.get $stepResult))
    (select (local.get $samples) (i32.sub (i32.const 0) (local.get $samples)) (local.get $done)))

  ;; runDiscreteSteps: n samples of the loop after a 1 rad phase step (DF2T sections, states at 640 zeroed
  ;; by the caller), every stride-th sample's time and errors kept from 2048; returns the samples kept, or
  ;; −1 − kept when the loop diverged (an error reached divergedRad).
  (func (export "discreteSteps") (param $k i32) (param $kt f64) (param $t f64) (param $twoPiT f64) (param $n i32) (param $stride i32) (param $divergedRad f64) (result i32)
    (local $i i32) (local $untilKept i32) (local $kept i32) (local $j i32) (local $c i32) (local $s i32)
    (local $thetaO f64) (local $before f64) (local $e f64) (local $f f64) (local $x f64) (local $y f64)
    (block $ran
      (loop $sample
        (br_if $ran (i32.ge_s (local.get $i) (local.get $n)))
        (local.set $e (f64.sub (f64.const 1) (local.get $thetaO)))
        (local.set $f (f64.mul (local.get $twoPiT) (local.get $before)))
        (local.set $before (f64.add (local.get $before) (local.get $e)))
        (if (i32.eqz (i32.and (f64.lt (f64.abs (local.get $f)) (local.get $divergedRad)) (f64.lt (f64.abs (local.get $e)) (local.get $divergedRad))))
          (then (return (i32.sub (i32.const -1) (local.get $kept)))))
        (if (i32.eqz (local.get $untilKept))
          (then
            (local.set $untilKept (local.get $stride))
            (f64.store offset=2048 (i32.shl (local.get $kept) (i32.const 3)) (f64.mul (f64.convert_i32_s (local.get $i)) (local.get $t)))
            (f64.store offset=10240 (i32.shl (local.get $kept) (i32.const 3)) (local.get $e))
            (f64.store offset=18432 (i32.shl (local.get $kept) (i32.const 3)) (local.get $f))
            (local.set $kept (i32.add (local.get $kept) (i32.const 1)))))
        (local.set $x (local.get $e))
        (local.set $j (i32.const 0))
        (block $sectionsDone
          (loop $section
            (br_if $sectionsDone (i32.ge_s (local.get $j) (local.get $k)))
            (local.set $c (i32.mul (local.get $j) (i32.const 40)))
            (local.set $s (i32.add (i32.const 640) (i32.shl (local.get $j) (i32.const 4))))
            (local.set $y (f64.add (f64.mul (f64.load (local.get $c)) (local.get $x)) (f64.load (local.get $s))))
            (f64.store (local.get $s)
              (f64.add
                (f64.sub (f64.mul (f64.load offset=8 (local.get $c)) (local.get $x)) (f64.mul (f64.load offset=24 (local.get $c)) (local.get $y)))
                (f64.load offset=8 (local.get $s))))
            (f64.store offset=8 (local.get $s)
              (f64.sub (f64.mul (f64.load offset=16 (local.get $c)) (local.get $x)) (f64.mul (f64.load offset=32 (local.get $c)) (local.get $y))))
            (local.set $x (local.get $y))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $section)))
        (local.set $thetaO (f64.add (local.get $thetaO) (f64.mul (local.get $kt) (local.get $x))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (local.set $untilKept (i32.sub (local.get $untilKept) (i32.const 1)))
        (br $sample)))
    (local.get $kept))

  ;; multiply: out = x·y for row-major n×n matrices at byte offsets x, y, out (linearLoop.ts, multiply):
  ;; each element summed from +0 over l in increasing order, skipping x[i][l] = 0, four columns of a row
  ;; side by side (two in each of two f64x2 sums), then two, then one. A skipped term is a select of the
  ;; sum as it was, not a branch: which entries are 0 changes from matrix to matrix, and a branch on it
  ;; was mispredicted and kept the sums of different rows from running side by side.
  (func $multiply (export "multiply") (param $x i32) (param $y i32) (param $n i32) (param $out i32)
    (local $rowBytes i32) (local $i i32) (local $j i32) (local $l i32) (local $xr i32) (local $or i32) (local $yl i32)
    (local $xil f64) (local $s v128) (local $acc0 v128) (local $acc1 v128) (local $acc f64) (local $skip i32)
    (local.set $rowBytes (i32.shl (local.get $n) (i32.const 3)))
    (block $rowsDone
      (loop $rows
        (br_if $rowsDone (i32.ge_s (local.get $i) (local.get $n)))
        (local.set $xr (i32.add (local.get $x) (i32.mul (local.get $i) (local.get $rowBytes))))
        (local.set $or (i32.add (local.get $out) (i32.mul (local.get $i) (local.get $rowBytes))))
        (local.set $j (i32.const 0))
        (block $quadsDone
          (loop $quads
            (br_if $quadsDone (i32.ge_s (i32.add (local.get $j) (i32.const 3)) (local.get $n)))
            (local.set $acc0 (v128.const f64x2 0 0))
            (local.set $acc1 (v128.const f64x2 0 0))
            (local.set $yl (i32.add (local.get $y) (i32.shl (local.get $j) (i32.const 3))))
            (local.set $l (i32.const 0))
            (block $termsDone
              (loop $terms
                (br_if $termsDone (i32.ge_s (local.get $l) (local.get $n)))
                (local.set $xil (f64.load (i32.add (local.get $xr) (i32.shl (local.get $l) (i32.const 3)))))
                (local.set $skip (f64.eq (local.get $xil) (f64.const 0)))
                (local.set $s (f64x2.splat (local.get $xil)))
                (local.set $acc0 (select (local.get $acc0) (f64x2.add (local.get $acc0) (f64x2.mul (local.get $s) (v128.load (local.get $yl)))) (local.get $skip)))
                (local.set $acc1 (select (local.get $acc1) (f64x2.add (local.get $acc1) (f64x2.mul (local.get $s) (v128.load offset=16 (local.get $yl)))) (local.get $skip)))
                (local.set $yl (i32.add (local.get $yl) (local.get $rowBytes)))
                (local.set $l (i32.add (local.get $l) (i32.const 1)))
                (br $terms)))
            (v128.store (i32.add (local.get $or) (i32.shl (local.get $j) (i32.const 3))) (local.get $acc0))
            (v128.store offset=16 (i32.add (local.get $or) (i32.shl (local.get $j) (i32.const 3))) (local.get $acc1))
            (local.set $j (i32.add (local.get $j) (i32.const 4)))
            (br $quads)))
        (block $pairsDone
          (loop $pairs
            (br_if $pairsDone (i32.ge_s (i32.add (local.get $j) (i32.const 1)) (local.get $n)))
            (local.set $acc0 (v128.const f64x2 0 0))
            (local.set $yl (i32.add (local.get $y) (i32.shl (local.get $j) (i32.const 3))))
            (local.set $l (i32.const 0))
            (block $pairTermsDone
              (loop $pairTerms
                (br_if $pairTermsDone (i32.ge_s (local.get $l) (local.get $n)))
                (local.set $xil (f64.load (i32.add (local.get $xr) (i32.shl (local.get $l) (i32.const 3)))))
                (local.set $acc0 (select (local.get $acc0) (f64x2.add (local.get $acc0) (f64x2.mul (f64x2.splat (local.get $xil)) (v128.load (local.get $yl))))
                  (f64.eq (local.get $xil) (f64.const 0))))
                (local.set $yl (i32.add (local.get $yl) (local.get $rowBytes)))
                (local.set $l (i32.add (local.get $l) (i32.const 1)))
                (br $pairTerms)))
            (v128.store (i32.add (local.get $or) (i32.shl (local.get $j) (i32.const 3))) (local.get $acc0))
            (local.set $j (i32.add (local.get $j) (i32.const 2)))
            (br $pairs)))
        (if (i32.lt_s (local.get $j) (local.get $n))
          (then
            (local.set $acc (f64.const 0))
            (local.set $yl (i32.add (local.get $y) (i32.shl (local.get $j) (i32.const 3))))
            (local.set $l (i32.const 0))
            (block $lastDone
              (loop $last
                (br_if $lastDone (i32.ge_s (local.get $l) (local.get $n)))
                (local.set $xil (f64.load (i32.add (local.get $xr) (i32.shl (local.get $l) (i32.const 3)))))
                (local.set $acc (select (local.get $acc) (f64.add (local.get $acc) (f64.mul (local.get $xil) (f64.load (local.get $yl))))
                  (f64.eq (local.get $xil) (f64.const 0))))
                (local.set $yl (i32.add (local.get $yl) (local.get $rowBytes)))
                (local.set $l (i32.add (local.get $l) (i32.const 1)))
                (br $last)))
            (f64.store (i32.add (local.get $or) (i32.shl (local.get $j) (i32.const 3))) (local.get $acc))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $rows))))

  ;; gramian: noiseGains's doubling (linearLoop.ts, gramianNoiseGains) on the n×n matrices from 32768: A^(2^j)
  ;; (starting as A) and its square, two scratch, the transpose, then `count` Gramians Q (starting as
  ;; C_oᵀ·C_o): each round Q ← Q + (A^(2^j))ᵀ·Q·A^(2^j) for every Q, then A ← A², until every |A| entry is
  ;; below 1e-6 (returns 1) or one is not finite or above 1e150, or 64 rounds passed (returns 0).
  (func (export "gramian") (param $n i32) (param $count i32) (result i32)
    (local $size i32) (local $power i32) (local $square i32) (local $swap i32) (local $t i32) (local $u i32) (local $powerT i32)
    (local $grams i32) (local $iter i32) (local $g i32) (local $q i32) (local $i i32) (local $j i32) (local $end i32) (local $big f64)
    (local.set $size (i32.shl (i32.mul (local.get $n) (local.get $n)) (i32.const 3)))
    (local.set $power (i32.const 32768))
    (local.set $square (i32.add (i32.const 32768) (local.get $size)))
    (local.set $t (i32.add (local.get $square) (local.get $size)))
    (local.set $u (i32.add (local.get $t) (local.get $size)))
    (local.set $powerT (i32.add (local.get $u) (local.get $size)))
    (local.set $grams (i32.add (local.get $powerT) (local.get $size)))
    (block $stopped
      (loop $doubling
        (br_if $stopped (i32.ge_s (local.get $iter) (i32.const 64)))
        (local.set $i (i32.const 0))
        (block $transposed
          (loop $rows
            (br_if $transposed (i32.ge_s (local.get $i) (local.get $n)))
            (local.set $j (i32.const 0))
            (block $rowDone
              (loop $columns
                (br_if $rowDone (i32.ge_s (local.get $j) (local.get $n)))
                (f64.store (i32.add (local.get $powerT) (i32.shl (i32.add (i32.mul (local.get $j) (local.get $n)) (local.get $i)) (i32.const 3)))
                  (f64.load (i32.add (local.get $power) (i32.shl (i32.add (i32.mul (local.get $i) (local.get $n)) (local.get $j)) (i32.const 3)))))
                (local.set $j (i32.add (local.get $j) (i32.const 1)))
                (br $columns)))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            (br $rows)))
        (local.set $g (i32.const 0))
        (block $congruent
          (loop $each
            (br_if $congruent (i32.ge_s (local.get $g) (local.get $count)))
            (local.set $q (i32.add (local.get $grams) (i32.mul (local.get $g) (local.get $size))))
            (call $multiply (local.get $q) (local.get $power) (local.get $n) (local.get $t))
            (call $multiply (local.get $powerT) (local.get $t) (local.get $n) (local.get $u))
            (local.set $i (i32.const 0))
            (block $added
              (loop $add
                (br_if $added (i32.ge_s (local.get $i) (local.get $size)))
                (f64.store (i32.add (local.get $q) (local.get $i))
                  (f64.add (f64.load (i32.add (local.get $q) (local.get $i))) (f64.load (i32.add (local.get $u) (local.get $i)))))
                (local.set $i (i32.add (local.get $i) (i32.const 8)))
                (br $add)))
            (local.set $g (i32.add (local.get $g) (i32.const 1)))
            (br $each)))
        (call $multiply (local.get $power) (local.get $power) (local.get $n) (local.get $square))
        (local.set $swap (local.get $power))
        (local.set $power (local.get $square))
        (local.set $square (local.get $swap))
        (local.set $big (f64.const 0))
        (local.set $i (local.get $power))
        (local.set $end (i32.add (local.get $power) (local.get $size)))
        (block $scanned
          (loop $scan
            (br_if $scanned (i32.ge_u (local.get $i) (local.get $end)))
            (local.set $big (f64.max (local.get $big) (f64.abs (f64.load (local.get $i)))))
            (local.set $i (i32.add (local.get $i) (i32.const 8)))
            (br $scan)))
        (br_if $stopped (i32.or (f64.ne (local.get $big) (local.get $big)) (f64.gt (local.get $big) (f64.const 1e150))))
        (if (f64.lt (local.get $big) (f64.const 1e-6)) (then (return (i32.const 1))))
        (local.set $iter (i32.add (local.get $iter) (i32.const 1)))
        (br $doubling)))
    (i32.const 0))
)
