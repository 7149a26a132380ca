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

#endif
