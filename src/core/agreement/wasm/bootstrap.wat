;; The bootstrap's inner loops in WebAssembly SIMD128 (see bootstrap-wasm.ts, which lays out the
;; memory and keeps the JS code as reference and fallback). Every lane runs one resample's mulberry32
;; (i32x4.mul is Math.imul: the low 32 bits); a draw's index is the high word of the exact 64-bit
;; product output × count, which is what the JS doubles compute while count < 2^21.
;; Rebuild bootstrap-wasm-bytes.ts with `npm run wasm` after any change here.
(module
  (memory (export "memory") 1)

  ;; Four resamples' draws (states `s` before their first call) counted into the laned weights:
  ;; patOf[k] is the byte address of utterance k's row in the laned weights (8 i32 per row), and
  ;; `lane` the byte offset of this vector's first lane in that row (0 or 16).
  (func $draws4 (param $patOf i32) (param $count i32) (param $s v128) (param $lane i32)
    (local $i i32) (local $t v128) (local $k v128) (local $cnt v128) (local $a i32)
    (local.set $cnt (i32x4.splat (local.get $count)))
    (block $done
      (loop $draw
        (br_if $done (i32.ge_u (local.get $i) (local.get $count)))
        (local.set $s (i32x4.add (local.get $s) (v128.const i32x4 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5)))
        ;; t = imul(s ^ s >>> 15, s | 1)
        (local.set $t (i32x4.mul
          (v128.xor (local.get $s) (i32x4.shr_u (local.get $s) (i32.const 15)))
          (v128.or (local.get $s) (v128.const i32x4 1 1 1 1))))
        ;; t ^= t + imul(t ^ t >>> 7, t | 61)
        (local.set $t (v128.xor (local.get $t) (i32x4.add (local.get $t) (i32x4.mul
          (v128.xor (local.get $t) (i32x4.shr_u (local.get $t) (i32.const 7)))
          (v128.or (local.get $t) (v128.const i32x4 61 61 61 61))))))
        ;; output t ^ t >>> 14; index = high word of output × count, then × 4 (bytes)
        (local.set $t (v128.xor (local.get $t) (i32x4.shr_u (local.get $t) (i32.const 14))))
        (local.set $k (i32x4.shl (i8x16.shuffle 4 5 6 7 12 13 14 15 20 21 22 23 28 29 30 31
          (i64x2.extmul_low_i32x4_u (local.get $t) (local.get $cnt))
          (i64x2.extmul_high_i32x4_u (local.get $t) (local.get $cnt))) (i32.const 2)))
        (local.set $a (i32.add (i32.load (i32.add (local.get $patOf) (i32x4.extract_lane 0 (local.get $k)))) (local.get $lane)))
        (i32.store offset=0 (local.get $a) (i32.add (i32.load offset=0 (local.get $a)) (i32.const 1)))
        (local.set $a (i32.add (i32.load (i32.add (local.get $patOf) (i32x4.extract_lane 1 (local.get $k)))) (local.get $lane)))
        (i32.store offset=4 (local.get $a) (i32.add (i32.load offset=4 (local.get $a)) (i32.const 1)))
        (local.set $a (i32.add (i32.load (i32.add (local.get $patOf) (i32x4.extract_lane 2 (local.get $k)))) (local.get $lane)))
        (i32.store offset=8 (local.get $a) (i32.add (i32.load offset=8 (local.get $a)) (i32.const 1)))
        (local.set $a (i32.add (i32.load (i32.add (local.get $patOf) (i32x4.extract_lane 3 (local.get $k)))) (local.get $lane)))
        (i32.store offset=12 (local.get $a) (i32.add (i32.load offset=12 (local.get $a)) (i32.const 1)))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $draw))))

  ;; States of four consecutive resamples: state, state + stride, … (mod 2^32).
  (func $states4 (param $state i32) (param $stride i32) (result v128)
    (i32x4.add (i32x4.splat (local.get $state))
      (i32x4.mul (i32x4.splat (local.get $stride)) (v128.const i32x4 0 1 2 3))))

  ;; Totals of `resamples` resamples from `state` (stride: state step per resample), 8 at a time.
  ;; The laned weights sit at address 0 (patterns × 32 bytes); colStart[k] (width + 1 i32) are byte
  ;; offsets into `pairs`, whose entries are (row address in the laned weights, value), by column.
  ;; Lane i's total of column k goes to out[(r + i) · width + k] (f64); the caller proved that the
  ;; i32 sums cannot overflow (count · max |value| < 2^31).
  (func (export "totals") (param $patOf i32) (param $count i32) (param $patterns i32) (param $colStart i32)
      (param $pairs i32) (param $width i32) (param $out i32) (param $state i32) (param $stride i32) (param $resamples i32)
    (local $r i32) (local $k i32) (local $j i32) (local $end i32) (local $a i32) (local $v v128)
    (local $acc0 v128) (local $acc1 v128) (local $o i32)
    (block $groups_done
      (loop $group
        (br_if $groups_done (i32.ge_u (local.get $r) (local.get $resamples)))
        (memory.fill (i32.const 0) (i32.const 0) (i32.shl (local.get $patterns) (i32.const 5)))
        (call $draws4 (local.get $patOf) (local.get $count) (call $states4 (local.get $state) (local.get $stride)) (i32.const 0))
        ;; the second half only when this group needs more than four lanes (its zero weights give zero totals)
        (if (i32.gt_u (i32.sub (local.get $resamples) (local.get $r)) (i32.const 4))
          (then
            (call $draws4 (local.get $patOf) (local.get $count)
              (call $states4 (i32.add (local.get $state) (i32.shl (local.get $stride) (i32.const 2))) (local.get $stride))
              (i32.const 16))))
        (local.set $k (i32.const 0))
        (block $cols_done
          (loop $col
            (br_if $cols_done (i32.ge_u (local.get $k) (local.get $width)))
            (local.set $acc0 (v128.const i32x4 0 0 0 0))
            (local.set $acc1 (v128.const i32x4 0 0 0 0))
            (local.set $j (i32.add (local.get $pairs)
              (i32.load (i32.add (local.get $colStart) (i32.shl (local.get $k) (i32.const 2))))))
            (local.set $end (i32.add (local.get $pairs)
              (i32.load offset=4 (i32.add (local.get $colStart) (i32.shl (local.get $k) (i32.const 2))))))
            (block $entries_done
              (loop $entry
                (br_if $entries_done (i32.ge_u (local.get $j) (local.get $end)))
                (local.set $a (i32.load offset=0 (local.get $j)))
                (local.set $v (i32x4.splat (i32.load offset=4 (local.get $j))))
                (local.set $acc0 (i32x4.add (local.get $acc0) (i32x4.mul (v128.load offset=0 (local.get $a)) (local.get $v))))
                (local.set $acc1 (i32x4.add (local.get $acc1) (i32x4.mul (v128.load offset=16 (local.get $a)) (local.get $v))))
                (local.set $j (i32.add (local.get $j) (i32.const 8)))
                (br $entry)))
            ;; o = out + ((r · width) + k) · 8; lane i is i · width · 8 bytes further
            (local.set $o (i32.add (local.get $out)
              (i32.shl (i32.add (i32.mul (local.get $r) (local.get $width)) (local.get $k)) (i32.const 3))))
            (local.set $a (i32.shl (local.get $width) (i32.const 3)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 0 (local.get $acc0))))
            (local.set $o (i32.add (local.get $o) (local.get $a)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 1 (local.get $acc0))))
            (local.set $o (i32.add (local.get $o) (local.get $a)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 2 (local.get $acc0))))
            (local.set $o (i32.add (local.get $o) (local.get $a)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 3 (local.get $acc0))))
            (local.set $o (i32.add (local.get $o) (local.get $a)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 0 (local.get $acc1))))
            (local.set $o (i32.add (local.get $o) (local.get $a)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 1 (local.get $acc1))))
            (local.set $o (i32.add (local.get $o) (local.get $a)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 2 (local.get $acc1))))
            (local.set $o (i32.add (local.get $o) (local.get $a)))
            (f64.store (local.get $o) (f64.convert_i32_s (i32x4.extract_lane 3 (local.get $acc1))))
            (local.set $k (i32.add (local.get $k) (i32.const 1)))
            (br $col)))
        (local.set $state (i32.add (local.get $state) (i32.shl (local.get $stride) (i32.const 3))))
        (local.set $r (i32.add (local.get $r) (i32.const 8)))
        (br $group))))

  ;; One changed utterance: per resample, how many of its `count` draws give an output in
  ;; [low, low + span) (one unsigned comparison after subtracting low; span < 2^32), into out[r] (i32).
  ;; Eight resamples at a time in two vectors; out holds a multiple of 8.
  (func (export "hitsOne") (param $count i32) (param $low i32) (param $span i32) (param $out i32)
      (param $state i32) (param $stride i32) (param $resamples i32)
    (local $r i32) (local $i i32) (local $s0 v128) (local $s1 v128) (local $t0 v128) (local $t1 v128)
    (local $h0 v128) (local $h1 v128) (local $lo v128) (local $sp v128)
    (local.set $lo (i32x4.splat (local.get $low)))
    (local.set $sp (i32x4.splat (local.get $span)))
    (block $groups_done
      (loop $group
        (br_if $groups_done (i32.ge_u (local.get $r) (local.get $resamples)))
        (local.set $s0 (call $states4 (local.get $state) (local.get $stride)))
        (local.set $s1 (call $states4 (i32.add (local.get $state) (i32.shl (local.get $stride) (i32.const 2))) (local.get $stride)))
        (local.set $h0 (v128.const i32x4 0 0 0 0))
        (local.set $h1 (v128.const i32x4 0 0 0 0))
        (local.set $i (i32.const 0))
        (block $done
          (loop $draw
            (br_if $done (i32.ge_u (local.get $i) (local.get $count)))
            (local.set $s0 (i32x4.add (local.get $s0) (v128.const i32x4 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5)))
            (local.set $s1 (i32x4.add (local.get $s1) (v128.const i32x4 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5)))
            (local.set $t0 (i32x4.mul
              (v128.xor (local.get $s0) (i32x4.shr_u (local.get $s0) (i32.const 15)))
              (v128.or (local.get $s0) (v128.const i32x4 1 1 1 1))))
            (local.set $t1 (i32x4.mul
              (v128.xor (local.get $s1) (i32x4.shr_u (local.get $s1) (i32.const 15)))
              (v128.or (local.get $s1) (v128.const i32x4 1 1 1 1))))
            (local.set $t0 (v128.xor (local.get $t0) (i32x4.add (local.get $t0) (i32x4.mul
              (v128.xor (local.get $t0) (i32x4.shr_u (local.get $t0) (i32.const 7)))
              (v128.or (local.get $t0) (v128.const i32x4 61 61 61 61))))))
            (local.set $t1 (v128.xor (local.get $t1) (i32x4.add (local.get $t1) (i32x4.mul
              (v128.xor (local.get $t1) (i32x4.shr_u (local.get $t1) (i32.const 7)))
              (v128.or (local.get $t1) (v128.const i32x4 61 61 61 61))))))
            (local.set $t0 (v128.xor (local.get $t0) (i32x4.shr_u (local.get $t0) (i32.const 14))))
            (local.set $t1 (v128.xor (local.get $t1) (i32x4.shr_u (local.get $t1) (i32.const 14))))
            ;; a hit is all ones (−1): subtracting it counts one
            (local.set $h0 (i32x4.sub (local.get $h0) (i32x4.lt_u (i32x4.sub (local.get $t0) (local.get $lo)) (local.get $sp))))
            (local.set $h1 (i32x4.sub (local.get $h1) (i32x4.lt_u (i32x4.sub (local.get $t1) (local.get $lo)) (local.get $sp))))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            (br $draw)))
        (v128.store offset=0 (i32.add (local.get $out) (i32.shl (local.get $r) (i32.const 2))) (local.get $h0))
        (v128.store offset=16 (i32.add (local.get $out) (i32.shl (local.get $r) (i32.const 2))) (local.get $h1))
        (local.set $state (i32.add (local.get $state) (i32.shl (local.get $stride) (i32.const 3))))
        (local.set $r (i32.add (local.get $r) (i32.const 8)))
        (br $group))))

  ;; Several changed utterances: `marked` holds a byte per position (1 if changed), changeOf[k] (i32)
  ;; the changed utterance's number c for a marked k. Per resample r and changed c, the number of
  ;; draws of c goes to hits[r · changed + c] (i32, zeroed here); four resamples at a time.
  (func (export "hitsMarked") (param $count i32) (param $marked i32) (param $changeOf i32) (param $changed i32)
      (param $hits i32) (param $state i32) (param $stride i32) (param $resamples i32)
    (local $r i32) (local $i i32) (local $s v128) (local $t v128) (local $k v128) (local $cnt v128)
    (local $x i32) (local $row i32) (local $a i32) (local $padded i32)
    (local.set $cnt (i32x4.splat (local.get $count)))
    (local.set $padded (i32.and (i32.add (local.get $resamples) (i32.const 3)) (i32.const -4)))
    (memory.fill (local.get $hits) (i32.const 0)
      (i32.shl (i32.mul (local.get $padded) (local.get $changed)) (i32.const 2)))
    (block $groups_done
      (loop $group
        (br_if $groups_done (i32.ge_u (local.get $r) (local.get $resamples)))
        (local.set $s (call $states4 (local.get $state) (local.get $stride)))
        ;; byte address of resample r's hit counts
        (local.set $row (i32.add (local.get $hits) (i32.shl (i32.mul (local.get $r) (local.get $changed)) (i32.const 2))))
        (local.set $i (i32.const 0))
        (block $done
          (loop $draw
            (br_if $done (i32.ge_u (local.get $i) (local.get $count)))
            (local.set $s (i32x4.add (local.get $s) (v128.const i32x4 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5 0x6d2b79f5)))
            (local.set $t (i32x4.mul
              (v128.xor (local.get $s) (i32x4.shr_u (local.get $s) (i32.const 15)))
              (v128.or (local.get $s) (v128.const i32x4 1 1 1 1))))
            (local.set $t (v128.xor (local.get $t) (i32x4.add (local.get $t) (i32x4.mul
              (v128.xor (local.get $t) (i32x4.shr_u (local.get $t) (i32.const 7)))
              (v128.or (local.get $t) (v128.const i32x4 61 61 61 61))))))
            (local.set $t (v128.xor (local.get $t) (i32x4.shr_u (local.get $t) (i32.const 14))))
            (local.set $k (i8x16.shuffle 4 5 6 7 12 13 14 15 20 21 22 23 28 29 30 31
              (i64x2.extmul_low_i32x4_u (local.get $t) (local.get $cnt))
              (i64x2.extmul_high_i32x4_u (local.get $t) (local.get $cnt))))
            ;; lane by lane: byte k of `marked`, then count the hit
            (local.set $x (i32x4.extract_lane 0 (local.get $k)))
            (if (i32.load8_u (i32.add (local.get $marked) (local.get $x)))
              (then
                (local.set $a (i32.add (local.get $row) (i32.shl (i32.load (i32.add (local.get $changeOf) (i32.shl (local.get $x) (i32.const 2)))) (i32.const 2))))
                (i32.store (local.get $a) (i32.add (i32.load (local.get $a)) (i32.const 1)))))
            (local.set $x (i32x4.extract_lane 1 (local.get $k)))
            (if (i32.load8_u (i32.add (local.get $marked) (local.get $x)))
              (then
                (local.set $a (i32.add (i32.add (local.get $row) (i32.shl (local.get $changed) (i32.const 2)))
                  (i32.shl (i32.load (i32.add (local.get $changeOf) (i32.shl (local.get $x) (i32.const 2)))) (i32.const 2))))
                (i32.store (local.get $a) (i32.add (i32.load (local.get $a)) (i32.const 1)))))
            (local.set $x (i32x4.extract_lane 2 (local.get $k)))
            (if (i32.load8_u (i32.add (local.get $marked) (local.get $x)))
              (then
                (local.set $a (i32.add (i32.add (local.get $row) (i32.shl (local.get $changed) (i32.const 3)))
                  (i32.shl (i32.load (i32.add (local.get $changeOf) (i32.shl (local.get $x) (i32.const 2)))) (i32.const 2))))
                (i32.store (local.get $a) (i32.add (i32.load (local.get $a)) (i32.const 1)))))
            (local.set $x (i32x4.extract_lane 3 (local.get $k)))
            (if (i32.load8_u (i32.add (local.get $marked) (local.get $x)))
              (then
                (local.set $a (i32.add (i32.add (local.get $row) (i32.mul (local.get $changed) (i32.const 12)))
                  (i32.shl (i32.load (i32.add (local.get $changeOf) (i32.shl (local.get $x) (i32.const 2)))) (i32.const 2))))
                (i32.store (local.get $a) (i32.add (i32.load (local.get $a)) (i32.const 1)))))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            (br $draw)))
        (local.set $state (i32.add (local.get $state) (i32.shl (local.get $stride) (i32.const 2))))
        (local.set $r (i32.add (local.get $r) (i32.const 4)))
        (br $group))))
)
