/* The account of --verify: how many values and monomials went through a second, independent route,
   how many could not (grouped by reason), and how many needed none (zero by the degree alone).
   Printed once on stderr at the end of a run; with --verify=strict every value left unchecked is
   an error at its statement.  Reasons are static texts (the VERIFY_WHY_* below or the caller's
   own literals): equal texts are counted together. */
#ifndef PSIKAPPA_VERIFY_ACCOUNT_H
#define PSIKAPPA_VERIFY_ACCOUNT_H

#include <stdio.h>

#include "interp.h"

typedef enum { VERIFY_VALUE = 0, VERIFY_MONOMIAL = 1 } verify_unit;

#define VERIFY_WHY_KDV_TABLE "the KdV recursion's table estimate is above --max-table"
#define VERIFY_WHY_KDV_DEPTH "2g-2+n is beyond the KdV recursion's depth limit"
#define VERIFY_WHY_KDV_LIMIT "the KdV recursion's table reached its limit"
#define VERIFY_WHY_SHIFT_TERMS "the time shift's work estimate is above --max-terms"
#define VERIFY_WHY_SHIFT_TABLE "the time shift's table estimate is above --max-table"
#define VERIFY_WHY_SHIFT_TIME "the time shift's time estimate is above --max-seconds"
#define VERIFY_WHY_SHIFT_LIMIT "the time shift's table reached its limit"
#define VERIFY_WHY_REDUCTION_TERMS "the reduction's estimate of correlator terms is above --max-terms"
#define VERIFY_WHY_REDUCTION_TABLE "the reduction's table estimate is above --max-table"
#define VERIFY_WHY_REDUCTION_TIME "the reduction's time estimate is above --max-seconds"
#define VERIFY_WHY_REDUCTION_LIMIT "the reduction's table reached its limit"
#define VERIFY_WHY_REDUCTION_FAILED "the reduction stopped with an error"
#define VERIFY_WHY_MONOMIALS "some of its monomials could not be checked (see the monomials)"
#define VERIFY_WHY_NO_ROUTE_VOLUME "no second route for V_{g,n}(L) in genus 0 or 1 or with more than 6 points"
#define VERIFY_WHY_ENGINE_COST "the volume engine's estimate is above its limits"
#define VERIFY_WHY_NO_ROUTE_SERIES "no second route for specialisations of F"
#define VERIFY_WHY_NO_SECOND_ROUTE "its route has no second route"

/* Counts `count` units checked by a second route (ignored inside a second route). */
void verify_checked(interp *I, verify_unit u, double count);

/* Counts `count` units that could not be checked, for `why` (a static text).  For a value under
   --verify=strict, reports the error at `where` and returns 0; otherwise returns 1.  Ignored
   (returns 1) inside a second route. */
int verify_unchecked(interp *I, const node *where, verify_unit u, double count, const char *why);

/* The same for a value v that is the result of its statement: returns v, or NULL after releasing
   it when strict mode reported an error.  Takes ownership of v. */
value *verify_unchecked_value(interp *I, const node *where, value *v, const char *why);

/* Counts a value that is 0 by the degree alone: nothing to check. */
void verify_no_check_needed(interp *I);

/* Brackets a second route: counts made inside belong to the route being checked, not to the run. */
void verify_second_begin(interp *I);
void verify_second_end(interp *I);

/* Prints the account to f (nothing when --verify is off). */
void verify_print(const interp *I, FILE *f);

/* Releases the account (safe when none was made). */
void verify_account_free(interp *I);

#endif
