/* tseries_trig.h - sin, cos, sinh and cosh of a truncated series with zero constant term.
 *
 * Rational series use FLINT's fmpq_poly_{sin,cos,sinh,cosh}_series; otherwise the coefficients
 * come from the pair of first-order equations s' = c f', c' = -+ s f' (O(N^2) coefficient
 * products).  Ownership and error policy as in tseries.h: the result is caller-initialised, may
 * alias f, and is the error series (zero, order -1) after an error.
 */
#ifndef PSIKAPPA_SERIES_TSERIES_TRIG_H
#define PSIKAPPA_SERIES_TSERIES_TRIG_H

#include "series/tseries.h"

#ifdef __cplusplus
extern "C" {
#endif

enum { TS_SIN = 0, TS_COS = 1, TS_SINH = 2, TS_COSH = 3 };

/* Largest order accepted (TS_BADARG beyond): the generic path costs O(N^2) coefficient products. */
#define TSERIES_TRIG_MAX_ORDER ((slong) 1 << 13)

/* r = sin(f), cos(f), sinh(f) or cosh(f) (which = TS_SIN ...), order f->order.  f's x^0
   coefficient must be the zero polynomial (TS_NEEDS_ZERO_CONSTANT). */
int tseries_trig(tseries *r, const tseries *f, int which, const fmpq_mpoly_ctx_t ctx);

#ifdef __cplusplus
}
#endif

#endif
