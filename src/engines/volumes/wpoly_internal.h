/* The workspace of the volume-polynomial recursion, shared by wpoly_modp.c (the recursion) and
   wpoly_readout.c (W_a from its components). */
#ifndef PSIKAPPA_WPOLY_INTERNAL_H
#define PSIKAPPA_WPOLY_INTERNAL_H

#include "wpoly.h"
#include "wpvol_internal.h"

/* One component S of the recursion, for every genus h: X[0][h] = (d_0 F_h)[S] (h <= g),
   X[1][h] = (d_0^2 F_h)[S] and X[2][h] = (d_0^3 F_h)[S] (h < g), hat[h] the transform of
   X[1][h], and f[(m-(2g-1))*(L+1) + o] = [u^o] f_m[S] of genus g (one zero row more).  Valid
   for the prime of `epoch` and the exponents `sig` of its points.  Owned by the workspace
   (allocated on first use). */
typedef struct
{
    wpvol_biv_struct *X[3];
    ulong **hat;
    ulong *f;
    slong epoch;
    slong sig[WPOLY_MAX_POINTS];
} wpoly_comp_t;

enum { WPOLY_A = 0, WPOLY_B = 1, WPOLY_C = 2 };

/* Buffers for all primes and multi-indices of one (g, n) (owned by wpoly_ws_new/free). */
struct wpoly_ws_struct
{
    slong g, n, L, nm;        /* nm = 2^n components */
    slong nidx;
    const slong *idx;         /* borrowed multi-indices, n each */
    wpoly_comp_t *comp;       /* [0]: S = {}; [S]: S with 2+ points (or n = 1); [nm+e]: one
                                 point with exponent e (n >= 2) */
    slong ncomp;
    wpoly_comp_t *cur[1 << WPOLY_MAX_POINTS];   /* the block of each S for the current index */
    slong epoch;              /* number of the current prime (blocks of older ones are stale) */
    wpvol_biv_struct Dv;      /* d_0^4 F_{h} of one component (scratch) */
    slong fsz;                /* (3g-2)(L+1): rows of L+1 words so that f_{m+1}' stays inside */
    ulong *tmp;               /* L words */
    slong Tmax;               /* transform length of genus g */
    ulong *buf;               /* Tmax words */
    ulong **pa, **pb;         /* pointer lists for wpvol_ntt_dot2, g 2^n entries each */
    wpvol_ntt_t F;            /* tables, allocated on first use, refilled per prime */
    int use_ntt;
    /* per prime */
    nmod_t mod;
    wpvol_ctx_t ctx;
    ulong *fact, *ifact;      /* k! and 1/k! for k < nfact */
    slong nfact;
    /* per multi-index */
    slong q;                  /* points with a_i >= 2 */
    slong e[WPOLY_MAX_POINTS];
    /* the transposed route for n = 1 (wpoly_adjoint.c) */
    int adjoint;                     /* 1: use it for primes with transforms */
    struct wpoly_adj_struct *adj;    /* its buffers, allocated on first use */
};

/* W_a modulo the current prime from the components of the current multi-index a. */
ulong wpoly_readout(wpoly_ws_t *ws, const slong *a);
/* Makes a the current multi-index: its points with a_i >= 2 and their exponents. */
void wpoly_set_index(wpoly_ws_t *ws, const slong *a);

/* res[k] = (D-a)! W_a mod p for every index a of ws (n = 1) by the transposed recursion;
   the component {} (with its transforms: ws->use_ntt) must be computed for this prime.
   Returns WPVOL_OK, WPVOL_NOMEM or WPVOL_CANCELLED. */
int wpoly_adj_run(wpoly_ws_t *ws, ulong *res);
/* Releases the buffers of wpoly_adj_run (safe if none). */
void wpoly_adj_free(wpoly_ws_t *ws);

#endif
