//go:build amd64 && !purego

#include "textflag.h"

// Batch tristimulus kernels for AVX2 + FMA: for each of count spectra of n
// samples (stored one after another from v), three dot products with the
// weight rows wx, wy, wz, stored as X, Y, Z at dst.
//
// Sixteen samples a step go into four sets of three accumulators (twelve
// short dependency chains keep both FMA pipes busy); the sets are then
// summed pairwise, a block of eight and a block of four samples follow
// while they remain, the four lanes of each sum are folded pairwise, and
// the last n mod 4 samples are added in order. The order is fixed, so
// every call with the same spectrum gives the same bits.
//
// The two kernels differ only in how four samples are loaded: float64 as
// they are, or float32 widened to float64 (exactly) before the products.

// FMA4(off, src, a, b, c): a, b, c += src × the four weights of wx, wy, wz
// at sample DI + off/8.
#define FMA4(off, src, a, b, c) \
	VFMADD231PD off(AX)(DI*8), src, a \
	VFMADD231PD off(BX)(DI*8), src, b \
	VFMADD231PD off(CX)(DI*8), src, c

// SUM3(a, b, c, d, e, f): a, b, c += d, e, f.
#define SUM3(a, b, c, d, e, f) \
	VADDPD d, a, a \
	VADDPD e, b, b \
	VADDPD f, c, c

// FOLD(acc, xacc, xtmp): the four lanes of acc (xacc is its low half)
// summed into its low lane as (l0 + l2) + (l1 + l3).
#define FOLD(acc, xacc, xtmp) \
	VEXTRACTF128 $1, acc, xtmp \
	VADDPD xtmp, xacc, xacc \
	VHADDPD xacc, xacc, xacc

// TAIL1: one sample, widened into X12 by the caller, into the sums.
#define TAIL1 \
	VFMADD231SD (AX)(DI*8), X12, X0 \
	VFMADD231SD (BX)(DI*8), X12, X1 \
	VFMADD231SD (CX)(DI*8), X12, X2

#define ARGS \
	MOVQ dst+0(FP), R9 \
	MOVQ v+8(FP), SI \
	MOVQ wx+16(FP), AX \
	MOVQ wy+24(FP), BX \
	MOVQ wz+32(FP), CX \
	MOVQ n+40(FP), DX \
	MOVQ count+48(FP), R10 \
	MOVQ DX, R8 \
	ANDQ $-16, R8

#define ZERO12 \
	VXORPD Y0, Y0, Y0 \
	VXORPD Y1, Y1, Y1 \
	VXORPD Y2, Y2, Y2 \
	VXORPD Y3, Y3, Y3 \
	VXORPD Y4, Y4, Y4 \
	VXORPD Y5, Y5, Y5 \
	VXORPD Y6, Y6, Y6 \
	VXORPD Y7, Y7, Y7 \
	VXORPD Y8, Y8, Y8 \
	VXORPD Y9, Y9, Y9 \
	VXORPD Y10, Y10, Y10 \
	VXORPD Y11, Y11, Y11 \
	XORQ DI, DI

#define STORE_NEXT \
	VMOVSD X0, (R9) \
	VMOVSD X1, 8(R9) \
	VMOVSD X2, 16(R9) \
	ADDQ $24, R9 \
	ADDQ R11, SI \
	DECQ R10

// func xyzBatchAVX2(dst, v, wx, wy, wz *float64, n, count int)
TEXT ·xyzBatchAVX2(SB), NOSPLIT, $0-56
	ARGS
	TESTQ R10, R10
	JZ    done64
	MOVQ  DX, R11
	SHLQ  $3, R11 // bytes per spectrum

spectrum64:
	ZERO12
	TESTQ R8, R8
	JZ    sets64

loop64:
	VMOVUPD (SI)(DI*8), Y12
	VMOVUPD 32(SI)(DI*8), Y13
	VMOVUPD 64(SI)(DI*8), Y14
	VMOVUPD 96(SI)(DI*8), Y15
	FMA4(0, Y12, Y0, Y1, Y2)
	FMA4(32, Y13, Y3, Y4, Y5)
	FMA4(64, Y14, Y6, Y7, Y8)
	FMA4(96, Y15, Y9, Y10, Y11)
	ADDQ $16, DI
	CMPQ DI, R8
	JLT  loop64

sets64:
	SUM3(Y0, Y1, Y2, Y6, Y7, Y8)
	SUM3(Y3, Y4, Y5, Y9, Y10, Y11)
	MOVQ DX, R12
	SUBQ DI, R12
	CMPQ R12, $8
	JLT  four64
	VMOVUPD (SI)(DI*8), Y12
	VMOVUPD 32(SI)(DI*8), Y13
	FMA4(0, Y12, Y0, Y1, Y2)
	FMA4(32, Y13, Y3, Y4, Y5)
	ADDQ $8, DI
	SUBQ $8, R12

four64:
	SUM3(Y0, Y1, Y2, Y3, Y4, Y5)
	CMPQ R12, $4
	JLT  fold64
	VMOVUPD (SI)(DI*8), Y12
	FMA4(0, Y12, Y0, Y1, Y2)
	ADDQ $4, DI

fold64:
	FOLD(Y0, X0, X3)
	FOLD(Y1, X1, X4)
	FOLD(Y2, X2, X5)

tail64:
	CMPQ DI, DX
	JGE  store64
	VMOVSD (SI)(DI*8), X12
	TAIL1
	INCQ DI
	JMP  tail64

store64:
	STORE_NEXT
	JNZ spectrum64

done64:
	VZEROUPPER
	RET

// func xyzBatch32AVX2(dst *float64, v *float32, wx, wy, wz *float64, n, count int)
TEXT ·xyzBatch32AVX2(SB), NOSPLIT, $0-56
	ARGS
	TESTQ R10, R10
	JZ    done32
	MOVQ  DX, R11
	SHLQ  $2, R11 // bytes per spectrum

spectrum32:
	ZERO12
	TESTQ R8, R8
	JZ    sets32

loop32:
	VCVTPS2PD (SI)(DI*4), Y12
	VCVTPS2PD 16(SI)(DI*4), Y13
	VCVTPS2PD 32(SI)(DI*4), Y14
	VCVTPS2PD 48(SI)(DI*4), Y15
	FMA4(0, Y12, Y0, Y1, Y2)
	FMA4(32, Y13, Y3, Y4, Y5)
	FMA4(64, Y14, Y6, Y7, Y8)
	FMA4(96, Y15, Y9, Y10, Y11)
	ADDQ $16, DI
	CMPQ DI, R8
	JLT  loop32

sets32:
	SUM3(Y0, Y1, Y2, Y6, Y7, Y8)
	SUM3(Y3, Y4, Y5, Y9, Y10, Y11)
	MOVQ DX, R12
	SUBQ DI, R12
	CMPQ R12, $8
	JLT  four32
	VCVTPS2PD (SI)(DI*4), Y12
	VCVTPS2PD 16(SI)(DI*4), Y13
	FMA4(0, Y12, Y0, Y1, Y2)
	FMA4(32, Y13, Y3, Y4, Y5)
	ADDQ $8, DI
	SUBQ $8, R12

four32:
	SUM3(Y0, Y1, Y2, Y3, Y4, Y5)
	CMPQ R12, $4
	JLT  fold32
	VCVTPS2PD (SI)(DI*4), Y12
	FMA4(0, Y12, Y0, Y1, Y2)
	ADDQ $4, DI

fold32:
	FOLD(Y0, X0, X3)
	FOLD(Y1, X1, X4)
	FOLD(Y2, X2, X5)

tail32:
	CMPQ DI, DX
	JGE  store32
	VCVTSS2SD (SI)(DI*4), X12, X12
	TAIL1
	INCQ DI
	JMP  tail32

store32:
	STORE_NEXT
	JNZ spectrum32

done32:
	VZEROUPPER
	RET
