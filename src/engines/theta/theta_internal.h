/* theta_internal.h - what the two recursions of src/theta share: the table, the evaluation of a
 * key through the memo (with the tau_0 removal both routes rely on), and a sub-multiset odometer.
 * Not part of the public API.
 *
 * The memo (the container of src/engines/correlators/wk_memo.c) maps a partition d (descending, no zeros)
 * of g-1 to the integer
 *     X(d) = 2^(4g-1) prod_i (2 d_i + 1)!! <Theta | tau_d>_g ,
 * the same integer for keys with zeros (theta_key.c shows that tau_0 multiplies X by 2g-2+n).
 * Ownership: the table owns its memo; values are returned by copy, never by pointer, because the
 * memo's arrays move when they grow.
 */
#ifndef PSIKAPPA_THETA_INTERNAL_H
#define PSIKAPPA_THETA_INTERNAL_H

#include <stdatomic.h>
#include <flint/fmpz.h>
#include "theta.h"
#include "correlators/wk_internal.h"

struct theta_table {
    int route;                       /* THETA_ROUTE_VIRASORO or THETA_ROUTE_KDV */
    wk_table *memo;                  /* zero-free keys -> X */
    atomic_int *cancel;   /* not owned */
};

/* Distinct values (descending) with multiplicities, and an odometer a_i in [0, mul_i] running
   over the sub-multisets I of a multiset S; all arrays are owned by the struct. */
typedef struct {
    slong p;
    slong *val, *mul, *a;
} theta_msets;

/* x = X(key) for a descending key of length n (zeros allowed at the end), genus sum(key) + 1.
   Computes and memoises missing values by T's route.  Status codes of theta.h. */
int theta_eval(theta_table *T, const slong *key, slong n, fmpz_t x);

/* The route steps: x = X(key) for a zero-free descending key (n >= 1) of genus g. */
int theta_vir_step(theta_table *T, slong g, const slong *key, slong n, fmpz_t x);
int theta_kdv_step(theta_table *T, slong g, const slong *key, slong n, fmpz_t x);

/* Sorts key[0..n-1] into descending order (insertion sort: keys are short). */
void theta_key_sort(slong *key, slong n);

/* Fills M from the descending array S (length ns) with the odometer at I = {}.
   Returns WK_OK or WK_LIMIT (out of memory); release with theta_msets_clear. */
int theta_msets_init(theta_msets *M, const slong *S, slong ns);
void theta_msets_clear(theta_msets *M);

/* Advances the odometer; returns 0 after the last sub-multiset (the odometer is then reset). */
int theta_msets_next(theta_msets *M);

/* Writes extra values (ne of them), then I (sel = 1) or its complement J (sel = 0), into out,
   sorted descending.  Returns the length. */
slong theta_msets_write(const theta_msets *M, int sel, const slong *extra, slong ne, slong *out);

/* c = prod_i binomial(mul_i, a_i): the number of position subsets giving the sub-multiset I. */
void theta_msets_count(fmpz_t c, const theta_msets *M);

/* Checks of the kappa integrals (BADARG, UNSTABLE, LIMIT as for theta_correlator); *K receives
   the kappa degree sum_{j>=1} j kmult[j], or -2 when the integral is zero by degree. */
int theta_kappa_check(slong *K, slong g, const slong *d, slong n, const slong *kmult, slong kmax);

#endif
