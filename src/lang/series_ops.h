/* Series values in the language: arithmetic with numbers and other series,
   conversions, and the messages for operations a series does not allow. */
#ifndef PSIKAPPA_SERIES_OPS_H
#define PSIKAPPA_SERIES_OPS_H

#include "interp.h"

/* Reports the tseries error rc at node `at` (mentioning `what`). */
void series_report(const node *at, int rc, const char *what);

/* Sets out (initialised in var, order) to v: a number is truncated, a series in
   the same variable is copied. Returns 1, or 0 after reporting an error at `at`. */
int series_from_value(interp *I, tseries *out, const value *v, const node *at);

/* a op b for op in + - * / where at least one of a, b is a series. */
value *series_arith(interp *I, const node *n, int op, const value *a, const value *b);
value *series_pow(interp *I, const node *n, const value *a, slong e);

/* How the coefficients of a result grow with the order (see series_size.c). */
enum { SERIES_COST_PRODUCT, SERIES_COST_QUOTIENT, SERIES_COST_POWER, SERIES_COST_EXP, SERIES_COST_LOG,
       SERIES_COST_COMPOSE };

/* Estimates the result of `what` (e.g. "this exp") on a (and b, or NULL) to
   `order`, |exponent| for powers (else 0); returns 1 when it is within the
   size limit and --max-seconds, else reports at `at` and returns 0. */
int series_size_ok(interp *I, const node *at, const char *what, int kind, const tseries *a, const tseries *b,
                   slong order, double exponent);

#endif
