/* spectral.h - correlators omega_{g,n} of a spectral curve with one simple branch point, and its
 * volume polynomials, exactly.
 *
 * The curve (conventions and their derivation: docs/conventions.md, "Spectral curves"):
 *     x = z^2/2,   B = dz_1 dz_2 / (z_1 - z_2)^2,   y_odd(z) = sum_{k=0}^{K} y_k z^{2k+1},  y_0 != 0,
 * the y_k polynomials over Q in the variables of a caller's fmpq_mpoly context, y_0 a nonzero
 * rational.  Only the odd part of y enters the recursion.  For 2g-2+n > 0
 *     omega_{g,n} = sum_d W_{g,n}[d] prod_i dz_i / z_i^{2 d_i + 2},
 *     W_{g,n}[d] = (-1)^n y_0^{2-2g-n} prod_i (2d_i+1)!! int_{Mbar_{g,n}} exp(sum_j s_j kappa_j) prod psi_i^{d_i},
 *     sum_k (2k+1)!! (y_k/y_0) u^k = exp(-sum_{j>=1} s_j u^j),
 * and by the Kaufmann-Manin-Zagier shift the same numbers are psi correlators at the KdV times
 * t_{k+1} = -p_k, p_k = (2k+1)!! y_k / y_0 (k >= 1).  The volume polynomial is the inverse Laplace
 * transform of omega_{g,n}: omega_{g,n} = int prod_i L_i e^{-z_i L_i} dL_i V_{g,n}(L) prod dz_i,
 *     [prod L_i^{2 d_i}] V_{g,n} = W_{g,n}[d] / prod_i (2 d_i + 1)!.
 *
 * Bessel-type curves (kind SP_CURVE_BESSEL) have a simple pole at the branch point instead:
 *     y_odd(z) = sum_{k=0}^{K} y_k z^{2k-1},  y_0 != 0,
 * and their correlators insert Norbury's class Theta (src/engines/theta/theta.h):
 *     W_{g,n}[d] = (-1)^n y_0^{2-2g-n} prod_i (2d_i+1)!! int_{Mbar_{g,n}} Theta exp(sum_j s_j kappa_j) prod psi_i^{d_i},
 *     sum_k (2k-1)!! (y_k/y_0) u^k = exp(-sum_{j>=1} s_j u^j),
 * that is Theta-psi numbers at the times t_k = -p_k, p_k = (2k-1)!! y_k / y_0 (k >= 1), t_0 = 0;
 * W vanishes in genus 0 and for |d| > g-1.  A curve of either kind is y_0..y_K with the kind.
 *
 * Two independent routes fill a table of W_{g,n}[d] (d sorted decreasingly, |d| <= 3g-3+n):
 * sp_omega_shift (intersection numbers: the correlator engine at the shifted times, or the volume
 * engine when only s_1 is nonzero) and sp_omega_residue (the topological recursion itself, residues
 * at z = 0 of the recursion kernel on Laurent expansions; it calls neither engine).
 *
 * Ownership: an sp_table owns its rows and coefficients (sp_table_init / sp_table_clear with the
 * same context); functions write into caller-initialised tables and fmpq_mpoly arrays and keep no
 * pointer to their arguments.  The context and the wk_table are the caller's.
 * Error policy: nothing aborts on bad input; functions return SP_OK or an error code below and
 * leave the output empty (table) or zero.
 */
#ifndef PSIKAPPA_SPECTRAL_SPECTRAL_H
#define PSIKAPPA_SPECTRAL_SPECTRAL_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>
#include "correlators/wk.h"
#include "theta/theta.h"

#ifdef __cplusplus
extern "C" {
#endif

enum {
    SP_OK = 0,
    SP_BADARG,         /* NULL pointers, g < 0, n < 1, K < 0 */
    SP_UNSTABLE,       /* 2g-2+n <= 0 */
    SP_Y0_ZERO,        /* y_0 = 0: the branch point is not simple (no odd linear term) */
    SP_Y0_NOT_RATIONAL,/* y_0 involves variables */
    SP_LIMIT,          /* estimate beyond the caller's limit, memo limit, memory */
    SP_CANCELLED
};

/* The kind of a curve: the lowest odd power of z in y is z (Airy type) or 1/z (Bessel type). */
enum { SP_CURVE_AIRY = 0, SP_CURVE_BESSEL = 1 };

/* Largest 3g-3+n accepted by either route (the correlators have up to 3g-3+2n points). */
#define SP_MAX_DIM 400

/* Largest number of rows (sorted d with |d| <= 3g-3+n) of a table. */
#define SP_MAX_ROWS 1e7

/* The coefficients W[d] of one omega_{g,n} (or of V_{g,n}), one row per sorted d. */
typedef struct {
    slong g, n, len;
    slong *d;                  /* len rows of n entries, d_1 >= ... >= d_n >= 0, |d| <= 3g-3+n */
    fmpq_mpoly_struct *c;      /* len coefficients */
} sp_table;

/* Options of the intersection route. */
typedef struct {
    int force_shift;           /* 1: never use the volume engine (tests, benchmarks) */
    int threads;               /* threads of the volume engine (>= 1) */
    double max_terms;          /* refuse when more correlators are estimated (0: no limit) */
    atomic_int *cancel;   /* polled; may be NULL; not owned */
    theta_table *theta;        /* Theta-psi numbers for Bessel-type curves (not owned); NULL: a
                                  table of the Virasoro route made and freed by the call */
} sp_options;

/* Default options: automatic route, one thread, no term limit, no cancel flag, no Theta table. */
void sp_options_default(sp_options *o);

/* Empty table (no rows); pair with sp_table_clear in the same context. */
void sp_table_init(sp_table *T, const fmpq_mpoly_ctx_t ctx);

/* Releases rows and coefficients; T is empty afterwards and may be reused. */
void sp_table_clear(sp_table *T, const fmpq_mpoly_ctx_t ctx);

/* Makes T the table of Mbar_{g,n} with every sorted row of |d| <= 3g-3+n (lexicographic order in
   (d_1, ..., d_n)) and zero coefficients.  SP_BADARG, SP_UNSTABLE, SP_LIMIT (dimension, or more
   than SP_MAX_ROWS rows). */
int sp_table_make_rows(sp_table *T, slong g, slong n, const fmpq_mpoly_ctx_t ctx);

/* Index of the sorted row d in T (binary search), -1 when absent. */
slong sp_table_find(const sp_table *T, const slong *d);

/* 1 when A and B have the same (g, n), rows and coefficients. */
int sp_table_equal(const sp_table *A, const sp_table *B, const fmpq_mpoly_ctx_t ctx);

/* SP_OK when y_0..y_K is a curve of the accepted form (y_0 a nonzero rational), else
   SP_BADARG, SP_Y0_ZERO or SP_Y0_NOT_RATIONAL. */
int sp_curve_check(const fmpq_mpoly_struct *y, slong K, const fmpq_mpoly_ctx_t ctx);

/* The dictionary, kappa side: s[j] for j = 1..N (s[0] is set to 0), from
   sum_k (2k+1)!! (y_k/y_0) u^k = exp(-sum_j s_j u^j), y_k = 0 for k > K.  s holds N+1
   initialised polynomials.  Status as sp_curve_check. */
int sp_times(fmpq_mpoly_struct *s, slong N, const fmpq_mpoly_struct *y, slong K,
             const fmpq_mpoly_ctx_t ctx);

/* The dictionary, psi side: p[k] = (2k+1)!! y_k / y_0 for k = 0..N (p[0] = 1); the KdV times of
   the shift are t_0 = t_1 = 0, t_{k+1} = -p_k.  Status as sp_curve_check. */
int sp_shift_times(fmpq_mpoly_struct *p, slong N, const fmpq_mpoly_struct *y, slong K,
                   const fmpq_mpoly_ctx_t ctx);

/* sp_times and sp_shift_times for a curve of either kind: for SP_CURVE_BESSEL the weights are
   (2k-1)!! instead of (2k+1)!!, and the Theta times are t_0 = 0, t_k = -p_k (k >= 1).
   SP_BADARG for an unknown kind. */
int sp_times_kind(fmpq_mpoly_struct *s, slong N, int kind, const fmpq_mpoly_struct *y, slong K,
                  const fmpq_mpoly_ctx_t ctx);
int sp_shift_times_kind(fmpq_mpoly_struct *p, slong N, int kind, const fmpq_mpoly_struct *y, slong K,
                        const fmpq_mpoly_ctx_t ctx);

/* Degree of the psi and kappa classes in W_{g,n} (rows with larger |d| vanish): 3g-3+n for the
   Airy kind, g-1 (what Theta leaves) for the Bessel kind. */
slong sp_curve_degree(int kind, slong g, slong n);

/* Number of correlators the intersection route evaluates for (g, n) with parts up to K (the
   partitions of the kappa degree times the rows of that psi degree); HUGE_VAL beyond 1e18. */
double sp_shift_estimate(slong g, slong n, slong K);

/* The same count for a curve of either kind (Theta-psi numbers for SP_CURVE_BESSEL). */
double sp_shift_estimate_kind(int kind, slong g, slong n, slong K);

/* 1 when sp_omega_shift (not forced to the shift) takes its coefficients from the volume engine:
   g >= 2, n <= 6 and s_j = 0 for 2 <= j <= 3g-3+n; 0 otherwise and on bad input. */
int sp_shift_uses_volumes(slong g, slong n, const fmpq_mpoly_struct *y, slong K, const fmpq_mpoly_ctx_t ctx);

/* out = W_{g,n} by intersection numbers (rows of sp_table_make_rows).  Correlators come from Tw
   (the caller's, may be shared).  When s_j = 0 for 2 <= j <= 3g-3+n, g >= 2 and n <= 6 (and
   o->force_shift is 0) the coefficients come from the volume engine instead.  Returns SP_OK or
   an error code; out is empty on error. */
int sp_omega_shift(sp_table *out, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                   wk_table *Tw, const sp_options *o, const fmpq_mpoly_ctx_t ctx);

/* sp_omega_shift for a curve of either kind.  SP_CURVE_BESSEL takes Theta-psi numbers from
   o->theta (or a private table; Tw is then not used and may be NULL); every row with |d| > g-1,
   and all of genus 0, is zero. */
int sp_omega_shift_kind(sp_table *out, int kind, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                        wk_table *Tw, const sp_options *o, const fmpq_mpoly_ctx_t ctx);

/* Number of memo entries (sorted multi-indices of all (g', n') reached) the residue route may
   need for (g, n), as a double; HUGE_VAL beyond 1e18. */
double sp_residue_estimate(slong g, slong n);

/* Largest g + n of the residue route (its multiset splits use binomial weights in a slong). */
#define SP_RESIDUE_MAX_POINTS 60

/* out = W_{g,n} by the topological recursion (residues at z = 0), independent of the correlator
   engines.  max_entries > 0 bounds the memo (SP_LIMIT beyond it, and for g + n above
   SP_RESIDUE_MAX_POINTS); cancel may be NULL. */
int sp_omega_residue(sp_table *out, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                     double max_entries, atomic_int *cancel, const fmpq_mpoly_ctx_t ctx);

/* sp_omega_residue for a curve of either kind (for SP_CURVE_BESSEL 1/y_odd starts at z^{+1}).
   It uses no Theta number: the zeros in genus 0 and beyond |d| = g-1 come out of the residues. */
int sp_omega_residue_kind(sp_table *out, int kind, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                          double max_entries, atomic_int *cancel, const fmpq_mpoly_ctx_t ctx);

/* V = the volume coefficients of W (same rows, each divided by prod (2 d_i + 1)!).
   V may be W. */
void sp_table_to_volume(sp_table *V, const sp_table *W, const fmpq_mpoly_ctx_t ctx);

/* A short English description of a status code (static storage). */
const char *sp_status_string(int status);

#ifdef __cplusplus
}
#endif

#endif
