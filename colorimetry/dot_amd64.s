//go:build amd64 && !purego

#include "textflag.h"

// Batch tristimulus kernel for AVX2 + FMA: for each of count spectra of n
// samples (stored one after another from v), three dot products with the
// weight rows wx, wy, wz, stored as X, Y, Z at dst. The summation order is
// fixed (eight lanes in two sets of four, then a block of four, the lanes
// folded pairwise, then the last n mod 4 samples in order), so every call
// with the same spectrum gives the same bits.
//
// The two kernels differ only in how a block of samples is loaded: float64
// as it is, or float32 widened to float64 (exact) before the products.

#define ZERO_ACC \
	VXORPD Y0, Y0, Y0 \
	VXORPD Y1, Y1, Y1 \
	VXORPD Y2, Y2, Y2 \
	VXORPD Y3, Y3, Y3 \
	VXORPD Y4, Y4, Y4 \
	VXORPD Y5, Y5, Y5

// FMA4(off, src, a, b, c): a, b, c += src · w[x|y|z][DI+off/8 …]
#define FMA4(off, src, a, b, c) \
	VFMADD231PD off(AX)(DI*8), src, a \
	VFMADD231PD off(BX)(DI*8), src, b \
	VFMADD231PD off(CX)(DI*8), src, c

// FOLD(acc, xacc, xtmp): the four lanes of acc (xacc its low half) summed
// into its low lane,
// pairwise: (l0 + l2) + (l1 + l3).
#define FOLD(acc, xacc, xtmp) \
	VEXTRACTF128 $1, acc, xtmp \
	VADDPD xtmp, xacc, xacc \
	VHADDPD xacc, xacc, xacc

#define STORE_NEXT \
	VMOVSD X0, (R9) \
	VMOVSD X1, 8(R9) \
	VMOVSD X2, 16(R9) \
	ADDQ $24, R9 \
	ADDQ R11, SI \
	DECQ R10

// func xyzBatchAVX2(dst, v, wx, wy, wz *float64, n, count int)
TEXT ·xyzBatchAVX2(SB), NOSPLIT, $0-56
	MOVQ dst+0(FP), R9
	MOVQ v+8(FP), SI
	MOVQ wx+16(FP), AX
	MOVQ wy+24(FP), BX
	MOVQ wz+32(FP), CX
	MOVQ n+40(FP), DX
	MOVQ count+48(FP), R10
	TESTQ R10, R10
	JZ   done64
	MOVQ DX, R11
	SHLQ $3, R11 // bytes per spectrum
	MOVQ DX, R8
	ANDQ $-8, R8 // samples in blocks of eight

spectrum64:
	ZERO_ACC
	XORQ DI, DI
	TESTQ R8, R8
	JZ   block64

loop64:
	VMOVUPD (SI)(DI*8), Y6
	VMOVUPD 32(SI)(DI*8), Y7
	FMA4(0, Y6, Y0, Y1, Y2)
	FMA4(32, Y7, Y3, Y4, Y5)
	ADDQ $8, DI
	CMPQ DI, R8
	JLT  loop64

block64:
	VADDPD Y3, Y0, Y0
	VADDPD Y4, Y1, Y1
	VADDPD Y5, Y2, Y2
	MOVQ DX, R12
	SUBQ DI, R12
	CMPQ R12, $4
	JLT  fold64
	VMOVUPD (SI)(DI*8), Y6
	FMA4(0, Y6, Y0, Y1, Y2)
	ADDQ $4, DI

fold64:
	FOLD(Y0, X0, X3)
	FOLD(Y1, X1, X4)
	FOLD(Y2, X2, X5)

tail64:
	CMPQ DI, DX
	JGE  store64
	VMOVSD (SI)(DI*8), X6
	VFMADD231SD (AX)(DI*8), X6, X0
	VFMADD231SD (BX)(DI*8), X6, X1
	VFMADD231SD (CX)(DI*8), X6, X2
	INCQ DI
	JMP  tail64

store64:
	STORE_NEXT
	JNZ  spectrum64

done64:
	VZEROUPPER
	RET

// func xyzBatch32AVX2(dst *float64, v *float32, wx, wy, wz *float64, n, count int)
TEXT ·xyzBatch32AVX2(SB), NOSPLIT, $0-56
	MOVQ dst+0(FP), R9
	MOVQ v+8(FP), SI
	MOVQ wx+16(FP), AX
	MOVQ wy+24(FP), BX
	MOVQ wz+32(FP), CX
	MOVQ n+40(FP), DX
	MOVQ count+48(FP), R10
	TESTQ R10, R10
	JZ   done32
	MOVQ DX, R11
	SHLQ $2, R11 // bytes per spectrum
	MOVQ DX, R8
	ANDQ $-8, R8

spectrum32:
	ZERO_ACC
	XORQ DI, DI
	TESTQ R8, R8
	JZ   block32

loop32:
	VCVTPS2PD (SI)(DI*4), Y6
	VCVTPS2PD 16(SI)(DI*4), Y7
	FMA4(0, Y6, Y0, Y1, Y2)
	FMA4(32, Y7, Y3, Y4, Y5)
	ADDQ $8, DI
	CMPQ DI, R8
	JLT  loop32

block32:
	VADDPD Y3, Y0, Y0
	VADDPD Y4, Y1, Y1
	VADDPD Y5, Y2, Y2
	MOVQ DX, R12
	SUBQ DI, R12
	CMPQ R12, $4
	JLT  fold32
	VCVTPS2PD (SI)(DI*4), Y6
	FMA4(0, Y6, Y0, Y1, Y2)
	ADDQ $4, DI

fold32:
	FOLD(Y0, X0, X3)
	FOLD(Y1, X1, X4)
	FOLD(Y2, X2, X5)

tail32:
	CMPQ DI, DX
	JGE  store32
	VCVTSS2SD (SI)(DI*4), X6, X6
	VFMADD231SD (AX)(DI*8), X6, X0
	VFMADD231SD (BX)(DI*8), X6, X1
	VFMADD231SD (CX)(DI*8), X6, X2
	INCQ DI
	JMP  tail32

store32:
	STORE_NEXT
	JNZ  spectrum32

done32:
	VZEROUPPER
	RET
