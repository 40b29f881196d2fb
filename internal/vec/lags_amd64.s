//go:build !purego

#include "textflag.h"

// func dot8FMA(a, b *float64, n int, out *[8]float64)
//
// out[q] = sum_{i<n} a[i] * b[i+q] for q = 0..7; n > 0 and a multiple of
// 8; b must hold n+7 values. Eight AVX2 accumulators, one per lag, each
// over four consecutive i; each step takes eight samples of a (A0 =
// a[i..i+3], A1 = a[i+4..i+7]) and loads each shifted window of b once:
// the windows at offsets 4..7 serve A0 for lags 4..7 and A1 for lags
// 0..3, which saves four of the eighteen loads of a plain loop.
TEXT ·dot8FMA(SB), NOSPLIT, $0-32
	MOVQ a+0(FP), SI
	MOVQ b+8(FP), DI
	MOVQ n+16(FP), CX
	MOVQ out+24(FP), DX
	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1
	VXORPD Y2, Y2, Y2
	VXORPD Y3, Y3, Y3
	VXORPD Y4, Y4, Y4
	VXORPD Y5, Y5, Y5
	VXORPD Y6, Y6, Y6
	VXORPD Y7, Y7, Y7
	XORQ AX, AX

loop:
	VMOVUPD (SI)(AX*8), Y8
	VMOVUPD 32(SI)(AX*8), Y9
	VFMADD231PD (DI)(AX*8), Y8, Y0
	VFMADD231PD 8(DI)(AX*8), Y8, Y1
	VFMADD231PD 16(DI)(AX*8), Y8, Y2
	VFMADD231PD 24(DI)(AX*8), Y8, Y3
	VMOVUPD     32(DI)(AX*8), Y10
	VFMADD231PD Y10, Y8, Y4
	VFMADD231PD Y10, Y9, Y0
	VMOVUPD     40(DI)(AX*8), Y10
	VFMADD231PD Y10, Y8, Y5
	VFMADD231PD Y10, Y9, Y1
	VMOVUPD     48(DI)(AX*8), Y10
	VFMADD231PD Y10, Y8, Y6
	VFMADD231PD Y10, Y9, Y2
	VMOVUPD     56(DI)(AX*8), Y10
	VFMADD231PD Y10, Y8, Y7
	VFMADD231PD Y10, Y9, Y3
	VFMADD231PD 64(DI)(AX*8), Y9, Y4
	VFMADD231PD 72(DI)(AX*8), Y9, Y5
	VFMADD231PD 80(DI)(AX*8), Y9, Y6
	VFMADD231PD 88(DI)(AX*8), Y9, Y7
	ADDQ $8, AX
	CMPQ AX, CX
	JLT  loop

	// Horizontal sums: lanes of Yq -> out[q].
	VEXTRACTF128 $1, Y0, X8
	VADDPD       X8, X0, X0
	VHADDPD      X0, X0, X0
	VMOVSD       X0, 0(DX)
	VEXTRACTF128 $1, Y1, X8
	VADDPD       X8, X1, X1
	VHADDPD      X1, X1, X1
	VMOVSD       X1, 8(DX)
	VEXTRACTF128 $1, Y2, X8
	VADDPD       X8, X2, X2
	VHADDPD      X2, X2, X2
	VMOVSD       X2, 16(DX)
	VEXTRACTF128 $1, Y3, X8
	VADDPD       X8, X3, X3
	VHADDPD      X3, X3, X3
	VMOVSD       X3, 24(DX)
	VEXTRACTF128 $1, Y4, X8
	VADDPD       X8, X4, X4
	VHADDPD      X4, X4, X4
	VMOVSD       X4, 32(DX)
	VEXTRACTF128 $1, Y5, X8
	VADDPD       X8, X5, X5
	VHADDPD      X5, X5, X5
	VMOVSD       X5, 40(DX)
	VEXTRACTF128 $1, Y6, X8
	VADDPD       X8, X6, X6
	VHADDPD      X6, X6, X6
	VMOVSD       X6, 48(DX)
	VEXTRACTF128 $1, Y7, X8
	VADDPD       X8, X7, X7
	VHADDPD      X7, X7, X7
	VMOVSD       X7, 56(DX)
	VZEROUPPER
	RET
