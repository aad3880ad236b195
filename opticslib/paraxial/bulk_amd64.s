//go:build amd64 && !purego

#include "textflag.h"

// The AVX2 kernel of System.TraceBulk: see bulkTraceAVX2 in bulk_amd64.go.
//
// Registers: SI, DX the heights and angles of the input rays; DI, R8 the
// rows of heights and angles (R8 = 0: no angles); R9 the row stride in
// bytes; R10 the mask byte (0: no mask); R11 the byte offset of the
// current eight rays, CX its end; R12 the program, R13 the current row's
// op; AX, BX the current row of heights and of angles.
// Y0, Y1 the heights of the eight rays, Y2, Y3 their angles; Y14, Y15
// their mask lanes; Y7 the finiteness sum; Y4, Y5, Y8–Y11 scratch.
//
// bulkOp offsets: kind 0, a 16, b 48, c 80, d 112, lo 144, hi 176 (each
// coefficient four times); 208 bytes per op.

// TESTY sets the mask lanes of the rays whose heights Y0, Y1 lie below lo
// or above hi (ordered compares: NaN is never outside).
#define TESTY \
	VCMPPD $0x01, 144(R13), Y0, Y8; \
	VCMPPD $0x0E, 176(R13), Y0, Y9; \
	VCMPPD $0x01, 144(R13), Y1, Y10; \
	VCMPPD $0x0E, 176(R13), Y1, Y11; \
	VORPD  Y8, Y14, Y14; \
	VORPD  Y9, Y14, Y14; \
	VORPD  Y10, Y15, Y15; \
	VORPD  Y11, Y15, Y15

// func bulkTraceAVX2(ops *bulkOp, ys, ts, heights, angles *float64, stride uintptr, mask *byte, count int, nt bool) (bad bool)
TEXT ·bulkTraceAVX2(SB), NOSPLIT, $0-73
	MOVQ ops+0(FP), R12
	MOVQ ys+8(FP), SI
	MOVQ ts+16(FP), DX
	MOVQ heights+24(FP), DI
	MOVQ angles+32(FP), R8
	MOVQ stride+40(FP), R9
	MOVQ mask+48(FP), R10
	MOVQ count+56(FP), CX
	SHLQ $3, CX
	XORQ R11, R11
	VXORPD Y7, Y7, Y7
	TESTQ CX, CX
	JZ done

group:
	VMOVUPD (SI)(R11*1), Y0
	VMOVUPD 32(SI)(R11*1), Y1
	VMOVUPD (DX)(R11*1), Y2
	VMOVUPD 32(DX)(R11*1), Y3
	VXORPD Y14, Y14, Y14
	VXORPD Y15, Y15, Y15
	MOVQ DI, AX
	MOVQ R8, BX
	MOVQ R12, R13

op:
	CMPQ (R13), $1
	JEQ  space
	CMPQ (R13), $3
	JEQ  surface
	CMPQ (R13), $2
	JEQ  lens
	CMPQ (R13), $0
	JEQ  store
	JMP  end

space:
	// y + d·θ, d held as b.
	TESTY
	VMULPD 48(R13), Y2, Y8
	VMULPD 48(R13), Y3, Y9
	VADDPD Y8, Y0, Y0
	VADDPD Y9, Y1, Y1
	TESTY
	JMP store

lens:
	// y unchanged; θ = c·y + d·θ.
	TESTY
	VMULPD 80(R13), Y0, Y8
	VMULPD 80(R13), Y1, Y9
	VMULPD 112(R13), Y2, Y10
	VMULPD 112(R13), Y3, Y11
	VADDPD Y10, Y8, Y2
	VADDPD Y11, Y9, Y3
	JMP store

surface:
	// y = a·y + b·θ, θ = c·y + d·θ.
	TESTY
	VMULPD 16(R13), Y0, Y8
	VMULPD 16(R13), Y1, Y9
	VMULPD 48(R13), Y2, Y10
	VMULPD 48(R13), Y3, Y11
	VADDPD Y10, Y8, Y8
	VADDPD Y11, Y9, Y9
	VMULPD 80(R13), Y0, Y4
	VMULPD 80(R13), Y1, Y5
	VMULPD 112(R13), Y2, Y2
	VMULPD 112(R13), Y3, Y3
	VADDPD Y2, Y4, Y2
	VADDPD Y3, Y5, Y3
	VMOVAPD Y8, Y0
	VMOVAPD Y9, Y1

store:
	CMPB nt+64(FP), $0
	JNE  ntstore
	VMOVUPD Y0, (AX)(R11*1)
	VMOVUPD Y1, 32(AX)(R11*1)
	TESTQ BX, BX
	JZ   next
	VMOVUPD Y2, (BX)(R11*1)
	VMOVUPD Y3, 32(BX)(R11*1)
	ADDQ R9, BX
	JMP  next

ntstore:
	VMOVNTPD Y0, (AX)(R11*1)
	VMOVNTPD Y1, 32(AX)(R11*1)
	TESTQ BX, BX
	JZ   next
	VMOVNTPD Y2, (BX)(R11*1)
	VMOVNTPD Y3, 32(BX)(R11*1)
	ADDQ R9, BX

next:
	ADDQ R9, AX
	ADDQ $208, R13
	JMP  op

end:
	// y − y and θ − θ are 0 for finite values and NaN otherwise.
	VSUBPD Y0, Y0, Y8
	VSUBPD Y1, Y1, Y9
	VSUBPD Y2, Y2, Y10
	VSUBPD Y3, Y3, Y11
	VADDPD Y8, Y7, Y7
	VADDPD Y9, Y7, Y7
	VADDPD Y10, Y7, Y7
	VADDPD Y11, Y7, Y7
	TESTQ R10, R10
	JZ   nomask
	VMOVMSKPD Y14, AX
	VMOVMSKPD Y15, BX
	SHLQ $4, BX
	ORQ  BX, AX
	MOVB AX, (R10)
	INCQ R10

nomask:
	ADDQ $64, R11
	CMPQ R11, CX
	JLT  group

done:
	SFENCE
	VCMPPD $0x03, Y7, Y7, Y8
	VMOVMSKPD Y8, AX
	TESTQ AX, AX
	SETNE bad+72(FP)
	VZEROUPPER
	RET
