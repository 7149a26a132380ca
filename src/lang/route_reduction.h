/* The pushforward reduction's parts that other modules reuse (route_reduction.c): the memoised
   monomial, the cost estimate, and the progress record of a run. */
#ifndef PSIKAPPA_ROUTE_REDUCTION_H
#define PSIKAPPA_ROUTE_REDUCTION_H

#include "classes/cpoly.h"
#include "interp.h"
#include "progress.h"

/* What the monomial callbacks need besides the interpreter: progress counting. */
typedef struct reduction_run {
    interp *I;
    progress bar;
    double done;
} reduction_run;

/* res = int_{Mbar_{g,n}} psi^psi kappa^kmult, memoised on the sorted psi (data: reduction_run).
   Returns WK_OK, a WK_* failure, or INTEGRATE_CANCELLED. */
int reduction_monomial(fmpq_t res, void *data, slong g, const slong *psi, slong n, const slong *kmult,
                       slong kmax);
/* The same, with the closed forms of psi-only monomials first (the reduction's own route). */
int reduction_compute_first(fmpq_t res, void *data, slong g, const slong *psi, slong n, const slong *kmult,
                            slong kmax);
/* Whether reducing P is within --max-terms, --max-table and --max-seconds: NULL if so, else the
   reason (a VERIFY_WHY_* text) with the error's message in msg; *seconds is the estimate. */
const char *reduction_cost_refusal(interp *I, const cpoly *P, char *msg, size_t len, double *seconds);

#endif
