//go:build amd64 && !purego

#include "textflag.h"

// The AVX2 kernel of the exact trace: see stepAVX2 in kernel_amd64.go and
// stepGo in kernel.go, whose loop it follows line by line, four rays per
// iteration.
//
// Registers: DI, SI, DX, R8, R9, R10, R11 the x, y, z, L, M, N and OPL
// arrays, R12 the statuses (bytes), R13 the stop surfaces (int32), BX the
// index of the current four rays, CX the count, AX and R14 scratch.
// Y0 the status codes of the rays that fail at this surface (0: none),
// Y1 the live lanes (status OK and no failure so far), Y2–Y15 scratch.
//
// op offsets (kernel.go): kind 0, conic 8, dz 16, c 24, k 32, k1 40,
// a2 48, mu 56, n 64, f 72, surf 80.
//
// The frame holds the op's coefficients and the constants, each four
// times (32 bytes), so that they can be memory operands.
#define F_DZ 0
#define F_C 32
#define F_K 64
#define F_CK1 96
#define F_A2 128
#define F_MU 160
#define F_MU2 192
#define F_NI 224
#define F_ONE 256
#define F_SIGN 288
#define F_ABS 320
#define F_INF 352
#define F_ZERO 384
#define F_M2 416
#define F_MISS 448
#define F_BACK 480
#define F_BLOCK 512
#define F_TIR 544
#define F_TMP 576
#define F_KIND 608
#define F_CONIC 616
#define F_SURF 624

// BCAST broadcasts the 64-bit pattern v (through BX and X15) into the
// frame slot at off. The move to X15 must be VEX-encoded (VMOVQ): the
// legacy SSE MOVQ, with the upper halves of the YMM registers in use,
// costs a state transition of about 100 ns on the processors measured
// (DEVELOPERS.md), ten times per call.
#define BCAST(v, off) \
	MOVQ $v, BX; \
	VMOVQ BX, X15; \
	VPBROADCASTQ X15, Y15; \
	VMOVDQU Y15, off(SP)

// OP broadcasts the op field at byte offset field into the frame slot off.
#define OP(field, off) \
	VBROADCASTSD field(AX), Y15; \
	VMOVUPD Y15, off(SP)

// func stepAVX2(o *op, x, y, z, l, m, n, opl *float64, st *Status, stop *int32, count int)
TEXT ·stepAVX2(SB), 0, $640-88
	MOVQ o+0(FP), AX
	OP(16, F_DZ)
	OP(24, F_C)
	OP(32, F_K)
	OP(48, F_A2)
	OP(56, F_MU)
	OP(64, F_NI)
	// c·(1+k) and μ², which stepGo computes per ray with the same rounding.
	VBROADCASTSD 24(AX), Y14
	VBROADCASTSD 40(AX), Y15
	VMULPD Y15, Y14, Y15
	VMOVUPD Y15, F_CK1(SP)
	VBROADCASTSD 56(AX), Y15
	VMULPD Y15, Y15, Y15
	VMOVUPD Y15, F_MU2(SP)
	MOVQ 0(AX), BX
	MOVQ BX, F_KIND(SP)
	MOVQ 8(AX), BX
	MOVQ BX, F_CONIC(SP)
	MOVQ 80(AX), BX
	MOVQ BX, F_SURF(SP)
	BCAST(0x3FF0000000000000, F_ONE)
	BCAST(-0x8000000000000000, F_SIGN)
	BCAST(0x7FFFFFFFFFFFFFFF, F_ABS)
	BCAST(0x7FF0000000000000, F_INF)
	BCAST(0, F_ZERO)
	BCAST(-0x4000000000000000, F_M2) // −2.0: 0xC000000000000000
	BCAST(1, F_MISS)  // Missed
	BCAST(4, F_BACK)  // Backward
	BCAST(3, F_BLOCK) // Blocked
	BCAST(2, F_TIR)   // TotalReflection

	MOVQ x+8(FP), DI
	MOVQ y+16(FP), SI
	MOVQ z+24(FP), DX
	MOVQ l+32(FP), R8
	MOVQ m+40(FP), R9
	MOVQ n+48(FP), R10
	MOVQ opl+56(FP), R11
	MOVQ st+64(FP), R12
	MOVQ stop+72(FP), R13
	MOVQ count+80(FP), CX
	XORQ BX, BX
	TESTQ CX, CX
	JLE  done

loop:
	// Live lanes: status OK. Skip four stopped rays at once.
	VPMOVZXBQ (R12)(BX*1), Y0
	VPCMPEQQ F_ZERO(SP), Y0, Y1
	VPTEST Y1, Y1
	JZ   next
	VPXOR Y0, Y0, Y0

	// To the vertex's tangent plane: t0 = −(z − dz)/N, x0, y0.
	VMOVUPD (DX)(BX*8), Y2
	VSUBPD F_DZ(SP), Y2, Y2
	VXORPD F_SIGN(SP), Y2, Y2
	VMOVUPD (R10)(BX*8), Y3 // N
	VDIVPD Y3, Y2, Y4       // t0
	VMOVUPD (R8)(BX*8), Y5  // L
	VMOVUPD (R9)(BX*8), Y6  // M
	VMULPD Y5, Y4, Y7
	VADDPD (DI)(BX*8), Y7, Y7 // x0 = x + t0·L
	VMULPD Y6, Y4, Y8
	VADDPD (SI)(BX*8), Y8, Y8 // y0 = y + t0·M

	// b = c(x0 L + y0 M) − N, cc = c(x0² + y0²), a = c(1 + k N²).
	VMULPD Y5, Y7, Y9
	VMULPD Y6, Y8, Y10
	VADDPD Y10, Y9, Y9
	VMULPD F_C(SP), Y9, Y9
	VSUBPD Y3, Y9, Y9 // b
	VMULPD Y7, Y7, Y10
	VMULPD Y8, Y8, Y11
	VADDPD Y11, Y10, Y10
	VMULPD F_C(SP), Y10, Y10 // cc
	VMULPD F_K(SP), Y3, Y11
	VMULPD Y3, Y11, Y11
	VADDPD F_ONE(SP), Y11, Y11
	VMULPD F_C(SP), Y11, Y11 // a

	// d = b² − a cc; q = −(b + sgn(b)√d).
	VMULPD Y10, Y11, Y11
	VMULPD Y9, Y9, Y12
	VSUBPD Y11, Y12, Y12            // d
	VCMPPD $0x1D, F_ZERO(SP), Y12, Y13 // d ≥ 0 (GE_OQ: false for NaN)
	VSQRTPD Y12, Y12
	VANDPD F_ABS(SP), Y12, Y12
	VANDPD F_SIGN(SP), Y9, Y11
	VORPD Y11, Y12, Y12
	VADDPD Y9, Y12, Y12
	VXORPD F_SIGN(SP), Y12, Y12        // q
	VCMPPD $0x04, F_ZERO(SP), Y12, Y11 // q ≠ 0 (NEQ_UQ: true for NaN, as Go's !=)
	VANDPD Y11, Y13, Y13
	VANDPD F_ABS(SP), Y4, Y11
	VCMPPD $0x01, F_INF(SP), Y11, Y11 // |t0| < +Inf (LT_OS: t0 finite)
	VANDPD Y11, Y13, Y13

	// Missed: the live lanes that failed.
	VANDNPD Y1, Y13, Y11
	VANDPD F_MISS(SP), Y11, Y11
	VORPD Y11, Y0, Y0
	VANDPD Y13, Y1, Y1

	// t1 = cc/q, t = t0 + t1; the point on the conic.
	VDIVPD Y12, Y10, Y10 // t1
	VADDPD Y10, Y4, Y11  // t
	VMULPD Y10, Y5, Y2
	VADDPD Y2, Y7, Y7 // xn = x0 + t1·L
	VMULPD Y10, Y6, Y2
	VADDPD Y2, Y8, Y8   // yn = y0 + t1·M
	VMULPD Y3, Y10, Y10 // zn = t1·N

	CMPQ F_KIND(SP), $4 // opImage
	JEQ  store

	// Backward: t < 0 (LT_OS).
	VCMPPD $0x01, F_ZERO(SP), Y11, Y12
	VANDPD Y1, Y12, Y12
	VANDPD F_BACK(SP), Y12, Y13
	VORPD Y13, Y0, Y0
	VANDNPD Y1, Y12, Y1

	// g3 = 1 − c(1+k) zn must be > 0 (GT_OS), else Missed.
	VMULPD F_CK1(SP), Y10, Y2
	VMOVUPD F_ONE(SP), Y4
	VSUBPD Y2, Y4, Y2
	VCMPPD $0x0E, F_ZERO(SP), Y2, Y4
	VANDNPD Y1, Y4, Y9
	VANDPD F_MISS(SP), Y9, Y9
	VORPD Y9, Y0, Y0
	VANDPD Y4, Y1, Y1

	// Blocked: xn² + yn² > a² (GT_OS: false for NaN, and for a² = +Inf).
	VMULPD Y7, Y7, Y9
	VMULPD Y8, Y8, Y12
	VADDPD Y12, Y9, Y9
	VCMPPD $0x0E, F_A2(SP), Y9, Y9
	VANDPD Y1, Y9, Y9
	VANDPD F_BLOCK(SP), Y9, Y12
	VORPD Y12, Y0, Y0
	VANDNPD Y1, Y9, Y1

	CMPQ F_KIND(SP), $2 // opStop
	JEQ  store

	// The normal (−c xn, −c yn, g3), normalised for a conic.
	VMULPD F_C(SP), Y7, Y4
	VXORPD F_SIGN(SP), Y4, Y4 // nx
	VMULPD F_C(SP), Y8, Y9
	VXORPD F_SIGN(SP), Y9, Y9 // ny
	CMPQ F_CONIC(SP), $0
	JEQ  cosine
	VMULPD Y4, Y4, Y12
	VMULPD Y9, Y9, Y13
	VADDPD Y13, Y12, Y12
	VMULPD Y2, Y2, Y13
	VADDPD Y13, Y12, Y12
	VSQRTPD Y12, Y12
	VMOVUPD F_ONE(SP), Y13
	VDIVPD Y12, Y13, Y13 // 1/|∇|
	VMULPD Y13, Y4, Y4
	VMULPD Y13, Y9, Y9
	VMULPD Y13, Y2, Y2

cosine:
	// cos I = (L nx + M ny) + N nz.
	VMULPD Y4, Y5, Y12
	VMULPD Y9, Y6, Y13
	VADDPD Y13, Y12, Y12
	VMULPD Y2, Y3, Y13
	VADDPD Y13, Y12, Y12
	CMPQ F_KIND(SP), $1 // opReflect
	JEQ  reflect

	// Refraction: c2 = 1 − μ²(1 − cos² I) ≥ 0 (GE_OQ), else TIR;
	// g = sgn(cos I)√c2 − μ cos I; d = μ d.
	VMULPD Y12, Y12, Y13
	VMOVUPD F_ONE(SP), Y14
	VSUBPD Y13, Y14, Y13
	VMULPD F_MU2(SP), Y13, Y13
	VSUBPD Y13, Y14, Y13 // c2
	VCMPPD $0x1D, F_ZERO(SP), Y13, Y14
	VANDNPD Y1, Y14, Y15
	VANDPD F_TIR(SP), Y15, Y15
	VORPD Y15, Y0, Y0
	VANDPD Y14, Y1, Y1
	VSQRTPD Y13, Y13
	VANDPD F_ABS(SP), Y13, Y13
	VANDPD F_SIGN(SP), Y12, Y14
	VORPD Y14, Y13, Y13
	VMULPD F_MU(SP), Y12, Y14
	VSUBPD Y14, Y13, Y13 // g
	VMULPD F_MU(SP), Y5, Y5
	VMULPD F_MU(SP), Y6, Y6
	VMULPD F_MU(SP), Y3, Y3
	JMP  direction

reflect:
	VMULPD F_M2(SP), Y12, Y13 // g = −2 cos I

direction:
	// d′ = d + g n̂, stored in the live lanes only (dead: Y15).
	VPCMPEQQ Y15, Y15, Y15
	VXORPD Y1, Y15, Y15
	VMULPD Y13, Y4, Y4
	VADDPD Y4, Y5, Y4
	VBLENDVPD Y15, (R8)(BX*8), Y4, Y4
	VMOVUPD Y4, (R8)(BX*8)
	VMULPD Y13, Y9, Y9
	VADDPD Y9, Y6, Y9
	VBLENDVPD Y15, (R9)(BX*8), Y9, Y9
	VMOVUPD Y9, (R9)(BX*8)
	VMULPD Y13, Y2, Y2
	VADDPD Y2, Y3, Y2
	VBLENDVPD Y15, (R10)(BX*8), Y2, Y2
	VMOVUPD Y2, (R10)(BX*8)

store:
	// OPL += n t; the point; in the live lanes only (dead: Y15).
	VPCMPEQQ Y15, Y15, Y15
	VXORPD Y1, Y15, Y15
	VMULPD F_NI(SP), Y11, Y11
	VADDPD (R11)(BX*8), Y11, Y11
	VBLENDVPD Y15, (R11)(BX*8), Y11, Y11
	VMOVUPD Y11, (R11)(BX*8)
	VBLENDVPD Y15, (DI)(BX*8), Y7, Y7
	VMOVUPD Y7, (DI)(BX*8)
	VBLENDVPD Y15, (SI)(BX*8), Y8, Y8
	VMOVUPD Y8, (SI)(BX*8)
	VBLENDVPD Y15, (DX)(BX*8), Y10, Y10
	VMOVUPD Y10, (DX)(BX*8)
	VPTEST Y0, Y0
	JNZ  fail

next:
	ADDQ $4, BX
	CMPQ BX, CX
	JLT  loop

done:
	VZEROUPPER
	RET

fail:
	// Some lanes failed: their status codes are in Y0.
	VMOVDQU Y0, F_TMP(SP)
	MOVQ F_SURF(SP), R14
	MOVQ (F_TMP+0)(SP), AX
	TESTQ AX, AX
	JZ   fail1
	MOVB AX, 0(R12)(BX*1)
	MOVL R14, 0(R13)(BX*4)

fail1:
	MOVQ (F_TMP+8)(SP), AX
	TESTQ AX, AX
	JZ   fail2
	MOVB AX, 1(R12)(BX*1)
	MOVL R14, 4(R13)(BX*4)

fail2:
	MOVQ (F_TMP+16)(SP), AX
	TESTQ AX, AX
	JZ   fail3
	MOVB AX, 2(R12)(BX*1)
	MOVL R14, 8(R13)(BX*4)

fail3:
	MOVQ (F_TMP+24)(SP), AX
	TESTQ AX, AX
	JZ   next
	MOVB AX, 3(R12)(BX*1)
	MOVL R14, 12(R13)(BX*4)
	JMP  next
