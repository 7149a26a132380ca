/* The language's side of the volume engine (fastvol.c): the session's table of normalised
   volumes, the few-point volume polynomials, and the sums that make integrals of them. */
#ifndef PSIKAPPA_FASTVOL_H
#define PSIKAPPA_FASTVOL_H

#include <stddef.h>

#include "interp.h"

/* Below this many correlator terms the reduction is as fast as the engine, and it stays the
   reference route. */
#define FASTVOL_MIN_TERMS 2000.0

/* Threads of the volume engines: the processors online, at most FASTVOL_MAX_THREADS. */
#define FASTVOL_MAX_THREADS 256
int fastvol_threads(void);

/* v = V_{g,n} (normalised) from the session's table, grown when needed; 0 after reporting. */
int fastvol_get(interp *I, const node *where, fmpq_t v, slong g, slong n);
void fastvol_clear(interp *I);
/* The estimate of making the table hold V_{g,n} (*seconds, 0 when it does, also after a
   stored table was read into it): NULL within the limits, else the reason, with the error's
   message in msg. */
const char *fastvol_table_cost(interp *I, slong g, slong n, double *seconds, char *msg, size_t len);

/* The same for the polynomial engine on the sorted multi-indices idx[0..nidx n). */
const char *fastvol_poly_cost(const interp *I, slong g, slong n, const slong *idx, slong nidx, double *seconds,
                              char *msg, size_t len);
/* Runs the polynomial engine on idx: the W_a (caller clears nidx entries), or NULL after
   reporting an error at where. */
fmpq *fastvol_poly_run(interp *I, const node *where, slong g, slong n, const slong *idx, slong nidx);
/* The same by the given route of the engine (WPOLY_ROUTE_* of volumes/wpoly.h). */
fmpq *fastvol_poly_run_route(interp *I, const node *where, slong g, slong n, const slong *idx, slong nidx,
                             int route);
/* Correlator terms the reduction would need for the coefficients idx of V_{g,n}(L). */
double fastvol_poly_terms(slong g, slong n, const slong *idx, slong nidx);
/* Whether the polynomial engine should take all coefficients idx[0..nidx n) of a few-point
   volume on Mbar_{g,n}, the reduction needing `terms` correlator terms: when forced, when the
   reduction would be refused, for one point once terms exceed FASTVOL_POLY_MIN_TERMS, and for
   n >= 2 when the engine's time estimate on every processor is below the reduction's. */
int fastvol_poly_wanted(interp *I, slong g, slong n, double terms, const slong *idx, slong nidx);
/* Whether the reduction of all coefficients of V_{g,n}(L) would need more table entries than
   --max-table allows (a fitted model for 2 <= n <= 6, the proven bound otherwise). */
int fastvol_reduction_refused(const interp *I, slong g, slong n);
/* Single-core seconds of that reduction, by the same model. */
double fastvol_reduction_seconds(slong g, slong n);
/* int_{g,n} exp(c kappa_1 + sum_i b_i psi_i) from the coefficients w of idx. New value. */
value *fastvol_exp_sum(interp *I, const fmpq *w, const slong *idx, slong nidx, slong n, slong D,
                       const fmpq_mpoly_t c, const fmpq_mpoly_struct *b);
/* Reports a failure of either volume engine in words (codes of wpvol.h). */
void fastvol_report(const node *where, int rc);

#endif
