/* builtins_spectral.h - helpers shared by the spectral-curve builtins (builtins_spectral.c) and
   their explain (builtins_spectral_explain.c); language side only. */
#ifndef PSIKAPPA_BUILTINS_SPECTRAL_H
#define PSIKAPPA_BUILTINS_SPECTRAL_H

#include <flint/fmpq_mpoly.h>
#include "builtins.h"
#include "series/tseries.h"

/* A curve read from a value: y_0..y_K in a small context holding only the variables used. */
typedef struct {
    slong z, K;                    /* curve variable (ring index), highest y_k read */
    int kind;                      /* SP_CURVE_AIRY (y_k of z^(2k+1)) or SP_CURVE_BESSEL (of z^(2k-1)) */
    fmpq_mpoly_ctx_t ctx;          /* nv >= 1 variables */
    slong nv;
    slong *map;                    /* local variable i is ring variable map[i] */
    fmpq_mpoly_struct *y;          /* K + 1 coefficients in ctx */
} bsp_curve;

/* Reads y_0..y_K from the curve (a series, argument i) into C, in a context of the variables
   used, then lowers K to the curve's own degree; `what` names the request in the error about a
   series known to too low an order.  Returns 0 after reporting an error (C is then empty);
   otherwise release C with bsp_curve_clear. */
int bsp_curve_read(interp *I, const node *call, value **args, int i, slong K, const char *what, bsp_curve *C);
void bsp_curve_clear(bsp_curve *C);

/* out (ring context) = p (the curve's context) with the curve's variables put back. */
void bsp_to_ring(interp *I, fmpq_mpoly_t out, const fmpq_mpoly_t p, const bsp_curve *C);

/* Argument i as a multi-index (an integer, or a list of integers >= 0): returns n and sets *d
   (owned by the caller), or 0 after reporting an error. */
slong bsp_read_index(interp *I, const node *call, value **args, int i, slong **d);

/* Reads x = c*z^2 (argument 0): sets *z and c; returns 0 after reporting an error. */
int bsp_read_x(interp *I, const node *call, const value *x, slong *z, fmpq_t c);

/* out = f times the terms of p whose degree in z has the given parity (1 odd, 0 even). */
void bsp_parity_part(fmpq_mpoly_t out, const fmpq_mpoly_t p, slong z, const fmpq_t f, int parity,
                     const fmpq_mpoly_ctx_t ctx);

/* Checks a curve value of either kind (leading coefficient a nonzero rational); 0 after reporting. */
int bsp_check_curve(interp *I, const node *at, const tseries *s);

/* Bessel-type curves (builtins_spectral_bessel.c).  A curve value is a series in z: y_odd for the
   Airy kind, z*y_odd (even, with a nonzero constant term) for the Bessel kind. */
int bsp_series_kind(interp *I, const tseries *s);
/* The highest y_k that omega_{g,n} of the curve value reads: 3g-3+n, or g-1 for the Bessel kind. */
slong bsp_curve_needs(interp *I, const value *curve, slong g, slong n);
/* Checks a Bessel-type curve value (constant term a rational, no odd terms); 0 after reporting. */
int bsp_check_bessel(interp *I, const node *at, const tseries *s);
/* Refuses omega_{g,n} of a Bessel-type curve by estimate (Theta table, correlator count). */
int bsp_refuse_bessel(interp *I, const node *call, const bsp_curve *C, slong g, slong n);
value *bsp_curve_over_z(interp *I, const node *call, value **args);

#endif
