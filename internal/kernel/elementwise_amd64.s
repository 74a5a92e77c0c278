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

// func phaseRotateAVX(re, im, cr, ci, tr, ti []float64)
TEXT ·phaseRotateAVX(SB), NOSPLIT, $0-144
	MOVQ re_base+0(FP), DI
	MOVQ re_len+8(FP), CX
	MOVQ im_base+24(FP), SI
	MOVQ cr_base+48(FP), R8
	MOVQ ci_base+72(FP), R9
	MOVQ tr_base+96(FP), R10
	MOVQ ti_base+120(FP), R11
	XORQ AX, AX

pr4:
	CMPQ CX, $4
	JLT  pr1
	VMOVUPD (R8)(AX*1), Y0
	VMOVUPD (R9)(AX*1), Y1
	VMOVUPD (R10)(AX*1), Y2
	VMOVUPD (R11)(AX*1), Y3
	VMULPD Y2, Y0, Y4
	VMULPD Y3, Y1, Y5
	VSUBPD Y5, Y4, Y4
	VMULPD Y3, Y0, Y6
	VMULPD Y2, Y1, Y7
	VADDPD Y7, Y6, Y6
	VMOVUPD (DI)(AX*1), Y8
	VMOVUPD (SI)(AX*1), Y9
	VMULPD Y8, Y4, Y10
	VMULPD Y9, Y6, Y11
	VSUBPD Y11, Y10, Y10
	VMULPD Y8, Y6, Y12
	VMULPD Y9, Y4, Y13
	VADDPD Y13, Y12, Y12
	VMOVUPD Y10, (DI)(AX*1)
	VMOVUPD Y12, (SI)(AX*1)
	ADDQ $32, AX
	SUBQ $4, CX
	JMP  pr4

pr1:
	CMPQ CX, $1
	JLT  prdone
	VMOVSD (R8)(AX*1), X0
	VMOVSD (R9)(AX*1), X1
	VMOVSD (R10)(AX*1), X2
	VMOVSD (R11)(AX*1), X3
	VMULSD X2, X0, X4
	VMULSD X3, X1, X5
	VSUBSD X5, X4, X4
	VMULSD X3, X0, X6
	VMULSD X2, X1, X7
	VADDSD X7, X6, X6
	VMOVSD (DI)(AX*1), X8
	VMOVSD (SI)(AX*1), X9
	VMULSD X8, X4, X10
	VMULSD X9, X6, X11
	VSUBSD X11, X10, X10
	VMULSD X8, X6, X12
	VMULSD X9, X4, X13
	VADDSD X13, X12, X12
	VMOVSD X10, (DI)(AX*1)
	VMOVSD X12, (SI)(AX*1)
	ADDQ $8, AX
	SUBQ $1, CX
	JMP  pr1

prdone:
	VZEROUPPER
	RET

// func axpyToAVX(dst, y []complex128, a complex128, x []complex128)
TEXT ·axpyToAVX(SB), NOSPLIT, $0-88
	MOVQ         dst_base+0(FP), DI
	MOVQ         dst_len+8(FP), CX
	MOVQ         y_base+24(FP), DX
	VBROADCASTSD a_real+48(FP), Y8
	VBROADCASTSD a_imag+56(FP), Y9
	MOVQ         x_base+64(FP), SI
	XORQ         AX, AX

axpy2:
	CMPQ       CX, $2
	JLT        axpy1
	VMOVUPD    (SI)(AX*1), Y0
	VPERMILPD  $5, Y0, Y1
	VMULPD     Y8, Y0, Y2
	VMULPD     Y9, Y1, Y3
	VADDSUBPD  Y3, Y2, Y4
	VMOVUPD    (DX)(AX*1), Y5
	VADDPD     Y4, Y5, Y5
	VMOVUPD    Y5, (DI)(AX*1)
	ADDQ       $32, AX
	SUBQ       $2, CX
	JMP        axpy2

axpy1:
	CMPQ       CX, $1
	JLT        axpydone
	VMOVUPD    (SI)(AX*1), X0
	VPERMILPD  $1, X0, X1
	VMULPD     X8, X0, X2
	VMULPD     X9, X1, X3
	VADDSUBPD  X3, X2, X4
	VMOVUPD    (DX)(AX*1), X5
	VADDPD     X4, X5, X5
	VMOVUPD    X5, (DI)(AX*1)

axpydone:
	VZEROUPPER
	RET

// func axpy2ToAVX(dst, y []complex128, a complex128, xa []complex128, b complex128, xb []complex128)
TEXT ·axpy2ToAVX(SB), NOSPLIT, $0-128
	MOVQ         dst_base+0(FP), DI
	MOVQ         dst_len+8(FP), CX
	MOVQ         y_base+24(FP), DX
	VBROADCASTSD a_real+48(FP), Y8
	VBROADCASTSD a_imag+56(FP), Y9
	MOVQ         xa_base+64(FP), SI
	VBROADCASTSD b_real+88(FP), Y10
	VBROADCASTSD b_imag+96(FP), Y11
	MOVQ         xb_base+104(FP), BX
	XORQ         AX, AX

pair2:
	CMPQ       CX, $2
	JLT        pair1
	VMOVUPD    (SI)(AX*1), Y0
	VPERMILPD  $5, Y0, Y1
	VMULPD     Y8, Y0, Y2
	VMULPD     Y9, Y1, Y3
	VADDSUBPD  Y3, Y2, Y4
	VMOVUPD    (DX)(AX*1), Y5
	VADDPD     Y4, Y5, Y5
	VMOVUPD    (BX)(AX*1), Y0
	VPERMILPD  $5, Y0, Y1
	VMULPD     Y10, Y0, Y2
	VMULPD     Y11, Y1, Y3
	VADDSUBPD  Y3, Y2, Y4
	VADDPD     Y4, Y5, Y5
	VMOVUPD    Y5, (DI)(AX*1)
	ADDQ       $32, AX
	SUBQ       $2, CX
	JMP        pair2

pair1:
	CMPQ       CX, $1
	JLT        pairdone
	VMOVUPD    (SI)(AX*1), X0
	VPERMILPD  $1, X0, X1
	VMULPD     X8, X0, X2
	VMULPD     X9, X1, X3
	VADDSUBPD  X3, X2, X4
	VMOVUPD    (DX)(AX*1), X5
	VADDPD     X4, X5, X5
	VMOVUPD    (BX)(AX*1), X0
	VPERMILPD  $1, X0, X1
	VMULPD     X10, X0, X2
	VMULPD     X11, X1, X3
	VADDSUBPD  X3, X2, X4
	VADDPD     X4, X5, X5
	VMOVUPD    X5, (DI)(AX*1)

pairdone:
	VZEROUPPER
	RET

// func axpy2PlanesAVX(dr, di, yr, yi []float64, a complex128, xar, xai []float64, b complex128, xbr, xbi []float64)
TEXT ·axpy2PlanesAVX(SB), NOSPLIT, $0-224
	MOVQ         dr_base+0(FP), DI
	MOVQ         dr_len+8(FP), CX
	MOVQ         di_base+24(FP), R8
	MOVQ         yr_base+48(FP), DX
	MOVQ         yi_base+72(FP), R9
	VBROADCASTSD a_real+96(FP), Y12
	VBROADCASTSD a_imag+104(FP), Y13
	MOVQ         xar_base+112(FP), SI
	MOVQ         xai_base+136(FP), R10
	VBROADCASTSD b_real+160(FP), Y14
	VBROADCASTSD b_imag+168(FP), Y15
	MOVQ         xbr_base+176(FP), BX
	MOVQ         xbi_base+200(FP), R11
	XORQ         AX, AX

planes4:
	CMPQ    CX, $4
	JLT     planes1
	VMOVUPD (SI)(AX*1), Y0
	VMOVUPD (R10)(AX*1), Y1
	VMULPD  Y12, Y0, Y2
	VMULPD  Y13, Y1, Y3
	VSUBPD  Y3, Y2, Y2
	VMULPD  Y12, Y1, Y4
	VMULPD  Y13, Y0, Y5
	VADDPD  Y5, Y4, Y4
	VMOVUPD (DX)(AX*1), Y6
	VADDPD  Y2, Y6, Y6
	VMOVUPD (R9)(AX*1), Y7
	VADDPD  Y4, Y7, Y7
	VMOVUPD (BX)(AX*1), Y0
	VMOVUPD (R11)(AX*1), Y1
	VMULPD  Y14, Y0, Y2
	VMULPD  Y15, Y1, Y3
	VSUBPD  Y3, Y2, Y2
	VMULPD  Y14, Y1, Y4
	VMULPD  Y15, Y0, Y5
	VADDPD  Y5, Y4, Y4
	VADDPD  Y2, Y6, Y6
	VADDPD  Y4, Y7, Y7
	VMOVUPD Y6, (DI)(AX*1)
	VMOVUPD Y7, (R8)(AX*1)
	ADDQ    $32, AX
	SUBQ    $4, CX
	JMP     planes4

planes1:
	CMPQ    CX, $1
	JLT     planesdone
	VMOVSD  (SI)(AX*1), X0
	VMOVSD  (R10)(AX*1), X1
	VMULSD  X12, X0, X2
	VMULSD  X13, X1, X3
	VSUBSD  X3, X2, X2
	VMULSD  X12, X1, X4
	VMULSD  X13, X0, X5
	VADDSD  X5, X4, X4
	VMOVSD  (DX)(AX*1), X6
	VADDSD  X2, X6, X6
	VMOVSD  (R9)(AX*1), X7
	VADDSD  X4, X7, X7
	VMOVSD  (BX)(AX*1), X0
	VMOVSD  (R11)(AX*1), X1
	VMULSD  X14, X0, X2
	VMULSD  X15, X1, X3
	VSUBSD  X3, X2, X2
	VMULSD  X14, X1, X4
	VMULSD  X15, X0, X5
	VADDSD  X5, X4, X4
	VADDSD  X2, X6, X6
	VADDSD  X4, X7, X7
	VMOVSD  X6, (DI)(AX*1)
	VMOVSD  X7, (R8)(AX*1)
	ADDQ    $8, AX
	SUBQ    $1, CX
	JMP     planes1

planesdone:
	VZEROUPPER
	RET

// func blockRowAVX(yr, yi, a, x []float64, k, n int)
//
// DI: yr, R15: yi, SI: a, DX: x, R8: k, R10: row stride 2n in bytes,
// R11: n in bytes (offset of the imaginary parts), R12: lane offset in
// bytes, CX: lanes left, R13/R14: row pointers, AX: rows left.
TEXT ·blockRowAVX(SB), NOSPLIT, $0-112
	MOVQ yr_base+0(FP), DI
	MOVQ yr_len+8(FP), CX
	MOVQ yi_base+24(FP), R15
	MOVQ a_base+48(FP), SI
	MOVQ x_base+72(FP), DX
	MOVQ k+96(FP), R8
	MOVQ n+104(FP), R11
	SHLQ $3, R11
	LEAQ (R11)(R11*1), R10
	XORQ R12, R12

brchunk:
	CMPQ    CX, $4
	JLT     brdone
	VXORPD  Y0, Y0, Y0
	VXORPD  Y1, Y1, Y1
	LEAQ    (SI)(R12*1), R13
	LEAQ    (DX)(R12*1), R14
	MOVQ    R8, AX
	TESTQ   AX, AX
	JZ      brstore

brrow:
	VMOVUPD (R13), Y2
	VMOVUPD (R13)(R11*1), Y3
	VMOVUPD (R14), Y4
	VMOVUPD (R14)(R11*1), Y5
	VMULPD  Y4, Y2, Y6
	VMULPD  Y5, Y3, Y7
	VSUBPD  Y7, Y6, Y6
	VADDPD  Y6, Y0, Y0
	VMULPD  Y5, Y2, Y8
	VMULPD  Y4, Y3, Y9
	VADDPD  Y9, Y8, Y8
	VADDPD  Y8, Y1, Y1
	ADDQ    R10, R13
	ADDQ    R10, R14
	DECQ    AX
	JNZ     brrow

brstore:
	VMOVUPD Y0, (DI)(R12*1)
	VMOVUPD Y1, (R15)(R12*1)
	ADDQ    $32, R12
	SUBQ    $4, CX
	JMP     brchunk

brdone:
	VZEROUPPER
	RET

// func rotateByAVX(re, im, cr, ci []float64)
TEXT ·rotateByAVX(SB), NOSPLIT, $0-96
	MOVQ re_base+0(FP), DI
	MOVQ re_len+8(FP), CX
	MOVQ im_base+24(FP), SI
	MOVQ cr_base+48(FP), R8
	MOVQ ci_base+72(FP), R9
	XORQ AX, AX

rb4:
	CMPQ    CX, $4
	JLT     rb1
	VMOVUPD (R8)(AX*1), Y8
	VMOVUPD (R9)(AX*1), Y9
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
	JMP     rb4

rb1:
	CMPQ   CX, $1
	JLT    rbdone
	VMOVSD (R8)(AX*1), X8
	VMOVSD (R9)(AX*1), X9
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
	JMP    rb1

rbdone:
	VZEROUPPER
	RET

// func rotateTwiceToAVX(dr, di, sr, si, cr, ci []float64)
TEXT ·rotateTwiceToAVX(SB), NOSPLIT, $0-144
	MOVQ dr_base+0(FP), DI
	MOVQ dr_len+8(FP), CX
	MOVQ di_base+24(FP), SI
	MOVQ sr_base+48(FP), R10
	MOVQ si_base+72(FP), R11
	MOVQ cr_base+96(FP), R8
	MOVQ ci_base+120(FP), R9
	XORQ AX, AX

rt4:
	CMPQ    CX, $4
	JLT     rt1
	VMOVUPD (R8)(AX*1), Y8
	VMOVUPD (R9)(AX*1), Y9
	VMOVUPD (R10)(AX*1), Y0
	VMOVUPD (R11)(AX*1), Y1
	VMULPD  Y0, Y8, Y2
	VMULPD  Y1, Y9, Y3
	VSUBPD  Y3, Y2, Y2
	VMULPD  Y0, Y9, Y4
	VMULPD  Y1, Y8, Y5
	VADDPD  Y5, Y4, Y4
	VMULPD  Y2, Y8, Y6
	VMULPD  Y4, Y9, Y7
	VSUBPD  Y7, Y6, Y6
	VMULPD  Y2, Y9, Y10
	VMULPD  Y4, Y8, Y11
	VADDPD  Y11, Y10, Y10
	VMOVUPD Y6, (DI)(AX*1)
	VMOVUPD Y10, (SI)(AX*1)
	ADDQ    $32, AX
	SUBQ    $4, CX
	JMP     rt4

rt1:
	CMPQ   CX, $1
	JLT    rtdone
	VMOVSD (R8)(AX*1), X8
	VMOVSD (R9)(AX*1), X9
	VMOVSD (R10)(AX*1), X0
	VMOVSD (R11)(AX*1), X1
	VMULSD X0, X8, X2
	VMULSD X1, X9, X3
	VSUBSD X3, X2, X2
	VMULSD X0, X9, X4
	VMULSD X1, X8, X5
	VADDSD X5, X4, X4
	VMULSD X2, X8, X6
	VMULSD X4, X9, X7
	VSUBSD X7, X6, X6
	VMULSD X2, X9, X10
	VMULSD X4, X8, X11
	VADDSD X11, X10, X10
	VMOVSD X6, (DI)(AX*1)
	VMOVSD X10, (SI)(AX*1)
	ADDQ   $8, AX
	DECQ   CX
	JMP    rt1

rtdone:
	VZEROUPPER
	RET
