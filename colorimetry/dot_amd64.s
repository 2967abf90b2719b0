//go:build amd64 && !purego

#include "textflag.h"

// Batch tristimulus kernels for AVX2 + FMA: for each of count spectra of n
// samples (stored one after another from v), three dot products with the
// weight rows wx, wy, wz, stored as X, Y, Z at dst.
//
// Three spectra go through together, so that each load of four weights
// serves three spectra and nine independent sums keep both FMA pipes busy;
// the last one or two spectra go through alone. Either way each sum runs
// over the samples four at a time in one four-lane accumulator, its lanes
// are folded as (l0 + l2) + (l1 + l3), and the last n mod 4 samples are
// added in order: the same operations in the same order, so a spectrum
// gives the same bits whether it goes through alone or with two others.
//
// The float64 and float32 kernels differ only in how four samples are
// loaded: as they are, or float32 widened to float64 (exactly).

// While three spectra are summed, the cache lines of the spectra twelve
// ahead are requested (PREFETCHT0), a group's worth per group, so the next
// data arrive while this is computed: on a two-core AMD EPYC this took the
// parallel batch from about 75 % to the read ceiling (BenchmarkReadCeiling).
#define AHEAD 12

// Registers: AX, BX, CX weight rows; SI, R13, R14 the (up to) three
// spectra; DI sample index; DX n; R8 n rounded down to a multiple of 4;
// R9 dst; R10 spectra left; R11 bytes per spectrum; R15 prefetch address.
// Y0–Y2, Y3–Y5, Y6–Y8: X, Y, Z sums of the spectra at SI, R13, R14.

#define ARGS \
	MOVQ dst+0(FP), R9 \
	MOVQ v+8(FP), SI \
	MOVQ wx+16(FP), AX \
	MOVQ wy+24(FP), BX \
	MOVQ wz+32(FP), CX \
	MOVQ n+40(FP), DX \
	MOVQ count+48(FP), R10 \
	MOVQ DX, R8 \
	ANDQ $-4, R8

#define ZERO3 \
	VXORPD Y0, Y0, Y0 \
	VXORPD Y1, Y1, Y1 \
	VXORPD Y2, Y2, Y2

#define ZERO9 \
	ZERO3 \
	VXORPD Y3, Y3, Y3 \
	VXORPD Y4, Y4, Y4 \
	VXORPD Y5, Y5, Y5 \
	VXORPD Y6, Y6, Y6 \
	VXORPD Y7, Y7, Y7 \
	VXORPD Y8, Y8, Y8

// W3(w, a, b, c): load four weights of row w into Y12 and add their
// products with the samples in Y9, Y10, Y11 to a, b, c.
#define W3(w, a, b, c) \
	VMOVUPD (w)(DI*8), Y12 \
	VFMADD231PD Y12, Y9, a \
	VFMADD231PD Y12, Y10, b \
	VFMADD231PD Y12, Y11, c

#define TRIPLE \
	W3(AX, Y0, Y3, Y6) \
	W3(BX, Y1, Y4, Y7) \
	W3(CX, Y2, Y5, Y8)

// ONE: the products of the four samples in Y9 into Y0, Y1, Y2.
#define ONE \
	VFMADD231PD (AX)(DI*8), Y9, Y0 \
	VFMADD231PD (BX)(DI*8), Y9, Y1 \
	VFMADD231PD (CX)(DI*8), Y9, Y2

// FOLD(acc, xacc, xtmp): the four lanes of acc (xacc is its low half)
// summed into its low lane as (l0 + l2) + (l1 + l3).
#define FOLD(acc, xacc, xtmp) \
	VEXTRACTF128 $1, acc, xtmp \
	VADDPD xtmp, xacc, xacc \
	VHADDPD xacc, xacc, xacc

#define FOLD3 \
	FOLD(Y0, X0, X13) \
	FOLD(Y1, X1, X13) \
	FOLD(Y2, X2, X13)

#define FOLD9 \
	FOLD3 \
	FOLD(Y3, X3, X13) \
	FOLD(Y4, X4, X13) \
	FOLD(Y5, X5, X13) \
	FOLD(Y6, X6, X13) \
	FOLD(Y7, X7, X13) \
	FOLD(Y8, X8, X13)

// TAIL(s, a, b, c): one sample, widened into s by the caller, into the
// sums a, b, c.
#define TAIL(s, a, b, c) \
	VFMADD231SD (AX)(DI*8), s, a \
	VFMADD231SD (BX)(DI*8), s, b \
	VFMADD231SD (CX)(DI*8), s, c

#define STORE3(off) \
	VMOVSD X0, off(R9) \
	VMOVSD X1, off+8(R9) \
	VMOVSD X2, off+16(R9)

#define STORE9 \
	STORE3(0) \
	VMOVSD X3, 24(R9) \
	VMOVSD X4, 32(R9) \
	VMOVSD X5, 40(R9) \
	VMOVSD X6, 48(R9) \
	VMOVSD X7, 56(R9) \
	VMOVSD X8, 64(R9)

// func xyzBatchAVX2(dst, v, wx, wy, wz *float64, n, count int)
TEXT ·xyzBatchAVX2(SB), NOSPLIT, $0-56
	ARGS
	MOVQ DX, R11
	SHLQ $3, R11 // bytes per spectrum

tri64:
	CMPQ R10, $3
	JLT  one64
	LEAQ (SI)(R11*1), R13
	LEAQ (R13)(R11*1), R14
	ZERO9
	XORQ DI, DI
	IMUL3Q $AHEAD, R11, R15
	ADDQ SI, R15

blocks3x64:
	CMPQ    DI, R8
	JGE     fold3x64
	PREFETCHT0 (R15)
	PREFETCHT0 64(R15)
	ADDQ    $96, R15 // 3 spectra × 4 samples × 8 bytes
	VMOVUPD (SI)(DI*8), Y9
	VMOVUPD (R13)(DI*8), Y10
	VMOVUPD (R14)(DI*8), Y11
	TRIPLE
	ADDQ    $4, DI
	JMP     blocks3x64

fold3x64:
	FOLD9

tail3x64:
	CMPQ   DI, DX
	JGE    store3x64
	VMOVSD (SI)(DI*8), X9
	VMOVSD (R13)(DI*8), X10
	VMOVSD (R14)(DI*8), X11
	TAIL(X9, X0, X1, X2)
	TAIL(X10, X3, X4, X5)
	TAIL(X11, X6, X7, X8)
	INCQ   DI
	JMP    tail3x64

store3x64:
	STORE9
	ADDQ $72, R9
	LEAQ (R14)(R11*1), SI
	SUBQ $3, R10
	JMP  tri64

one64:
	TESTQ R10, R10
	JZ    done64
	ZERO3
	XORQ  DI, DI

blocks1x64:
	CMPQ    DI, R8
	JGE     fold1x64
	VMOVUPD (SI)(DI*8), Y9
	ONE
	ADDQ    $4, DI
	JMP     blocks1x64

fold1x64:
	FOLD3

tail1x64:
	CMPQ   DI, DX
	JGE    store1x64
	VMOVSD (SI)(DI*8), X9
	TAIL(X9, X0, X1, X2)
	INCQ   DI
	JMP    tail1x64

store1x64:
	STORE3(0)
	ADDQ $24, R9
	ADDQ R11, SI
	DECQ R10
	JMP  one64

done64:
	VZEROUPPER
	RET

// func xyzBatch32AVX2(dst *float64, v *float32, wx, wy, wz *float64, n, count int)
TEXT ·xyzBatch32AVX2(SB), NOSPLIT, $0-56
	ARGS
	MOVQ DX, R11
	SHLQ $2, R11 // bytes per spectrum

tri32:
	CMPQ R10, $3
	JLT  one32
	LEAQ (SI)(R11*1), R13
	LEAQ (R13)(R11*1), R14
	ZERO9
	XORQ DI, DI
	IMUL3Q $AHEAD, R11, R15
	ADDQ SI, R15

blocks3x32:
	CMPQ      DI, R8
	JGE       fold3x32
	PREFETCHT0 (R15)
	ADDQ      $48, R15 // 3 spectra × 4 samples × 4 bytes
	VCVTPS2PD (SI)(DI*4), Y9
	VCVTPS2PD (R13)(DI*4), Y10
	VCVTPS2PD (R14)(DI*4), Y11
	TRIPLE
	ADDQ      $4, DI
	JMP       blocks3x32

fold3x32:
	FOLD9

tail3x32:
	CMPQ      DI, DX
	JGE       store3x32
	VCVTSS2SD (SI)(DI*4), X9, X9
	VCVTSS2SD (R13)(DI*4), X10, X10
	VCVTSS2SD (R14)(DI*4), X11, X11
	TAIL(X9, X0, X1, X2)
	TAIL(X10, X3, X4, X5)
	TAIL(X11, X6, X7, X8)
	INCQ      DI
	JMP       tail3x32

store3x32:
	STORE9
	ADDQ $72, R9
	LEAQ (R14)(R11*1), SI
	SUBQ $3, R10
	JMP  tri32

one32:
	TESTQ R10, R10
	JZ    done32
	ZERO3
	XORQ  DI, DI

blocks1x32:
	CMPQ      DI, R8
	JGE       fold1x32
	VCVTPS2PD (SI)(DI*4), Y9
	ONE
	ADDQ      $4, DI
	JMP       blocks1x32

fold1x32:
	FOLD3

tail1x32:
	CMPQ      DI, DX
	JGE       store1x32
	VCVTSS2SD (SI)(DI*4), X9, X9
	TAIL(X9, X0, X1, X2)
	INCQ      DI
	JMP       tail1x32

store1x32:
	STORE3(0)
	ADDQ $24, R9
	ADDQ R11, SI
	DECQ R10
	JMP  one32

done32:
	VZEROUPPER
	RET
