/* hodge_fp_internal.h - the pieces of the operator route (hodge_fp.c) shared with its splitting
 * sum (hodge_fp_split.c).  Not a public header.
 *
 * A state is <tau_d | C>_g, or <tau_d | C lambda_g>_g when the flag top is set: psi exponents d,
 * a multiset C of ch classes (cm[1..cmax] multiplicities) and lambda_g kept whole.  lambda_g
 * restricts to 0 on the irreducible divisor and to lambda_{g_1} lambda_{g_2} on a separating one
 * (c(E) = c(E_1) c(E_2)), so the flag passes to both sides; lambda_0 = 1.
 */
#ifndef PSIKAPPA_HODGE_FP_INTERNAL_H
#define PSIKAPPA_HODGE_FP_INTERNAL_H

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include "hodge_internal.h"

/* The sum of the terms of one recursion step, num/den, kept over the least common multiple of the
   term denominators seen so far and reduced once at the end: the terms of a step mostly share
   their denominators, so a division replaces the gcds of a rational addition per term.  p/q is
   the term being added (q > 0); x, y, w and b are scratch. */
typedef struct {
    fmpz_t num, den, p, q, x, y, w, b;
} hodge_fp_sum;

void hodge_fp_sum_init(hodge_fp_sum *S);
void hodge_fp_sum_clear(hodge_fp_sum *S);

/* num/den += p/q (q > 0). */
void hodge_fp_sum_add_term(hodge_fp_sum *S);

/* (*factor) (*val) = <tau_d | C>_g, times lambda_g if top (d in any order); zero for unstable
   spaces, wrong degrees and ch_{2k}.  *factor (below 2^31) is that of the dilaton equation for the
   exponents 1 removed before the memo.  *val points into the memo (or at a constant zero) and stays
   valid until the memo is cleared. */
int hodge_fp_corr(const fmpq **val, slong *factor, hodge_ctx *H, slong g, const slong *d, slong n, const slong *cm,
                  slong cmax, int top);

/* sum += 1/2 sum over ordered splittings g_1 + g_2 = g, I + J = points, C_1 + C_2 = C and node
   exponents a + b = 2l-2 of (-1)^a <tau_a tau_{d_I} | C_1>_{g_1} <tau_b tau_{d_J} | C_2>_{g_2}
   (the separating term of the operator; d sorted descending), each side with its lambda_{g_i}
   if top. */
int hodge_fp_split(hodge_fp_sum *S, hodge_ctx *H, slong g, const slong *d, slong n, const slong *cm, slong cmax,
                   slong l, int top);

#endif
