//go:build !noasm

#include "textflag.h"

// func foldAVX(s, d, a, b []float64)
TEXT ·foldAVX(SB), NOSPLIT, $0-96
	MOVQ s_base+0(FP), DI
	MOVQ s_len+8(FP), CX
	MOVQ d_base+24(FP), DX
	MOVQ a_base+48(FP), SI
	MOVQ b_base+72(FP), BX
	XORQ AX, AX

fold4:
	CMPQ CX, $4
	JLT  fold1
	VMOVUPD (SI)(AX*1), Y0
	VMOVUPD (BX)(AX*1), Y1
	VADDPD  Y1, Y0, Y2
	VSUBPD  Y1, Y0, Y3
	VMOVUPD Y2, (DI)(AX*1)
	VMOVUPD Y3, (DX)(AX*1)
	ADDQ    $32, AX
	SUBQ    $4, CX
	JMP     fold4

fold1:
	CMPQ CX, $1
	JLT  folddone
	VMOVSD (SI)(AX*1), X0
	VMOVSD (BX)(AX*1), X1
	VADDSD X1, X0, X2
	VSUBSD X1, X0, X3
	VMOVSD X2, (DI)(AX*1)
	VMOVSD X3, (DX)(AX*1)
	ADDQ   $8, AX
	DECQ   CX
	JMP    fold1

folddone:
	VZEROUPPER
	RET

// func rotateAVX(re, im []float64, c, s float64)
TEXT ·rotateAVX(SB), NOSPLIT, $0-64
	MOVQ         re_base+0(FP), DI
	MOVQ         re_len+8(FP), CX
	MOVQ         im_base+24(FP), SI
	VBROADCASTSD c+48(FP), Y8
	VBROADCASTSD s+56(FP), Y9
	XORQ         AX, AX

rot4:
	CMPQ    CX, $4
	JLT     rot1
	VMOVUPD (DI)(AX*1), Y0
	VMOVUPD (SI)(AX*1), Y1
	VMULPD  Y0, Y8, Y2
	VMULPD  Y1, Y9, Y3
	VSUBPD  Y3, Y2, Y2
	VMULPD  Y0, Y9, Y4
	VMULPD  Y1, Y8, Y5
	VADDPD  Y5, Y4, Y4
	VMOVUPD Y2, (DI)(AX*1)
	VMOVUPD Y4, (SI)(AX*1)
	ADDQ    $32, AX
	SUBQ    $4, CX
	JMP     rot4

rot1:
	CMPQ   CX, $1
	JLT    rotdone
	VMOVSD (DI)(AX*1), X0
	VMOVSD (SI)(AX*1), X1
	VMULSD X0, X8, X2
	VMULSD X1, X9, X3
	VSUBSD X3, X2, X2
	VMULSD X0, X9, X4
	VMULSD X1, X8, X5
	VADDSD X5, X4, X4
	VMOVSD X2, (DI)(AX*1)
	VMOVSD X4, (SI)(AX*1)
	ADDQ   $8, AX
	DECQ   CX
	JMP    rot1

rotdone:
	VZEROUPPER
	RET
