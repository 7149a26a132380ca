/* The interpreter: global state, limits, and running programs. */
#ifndef PSIKAPPA_INTERP_H
#define PSIKAPPA_INTERP_H

#include <setjmp.h>
#include <stdio.h>

#include "ast.h"
#include "correlators/wk.h"
#include "env.h"
#include "output.h"
#include "keymap.h"
#include "scalar.h"
#include "sink.h"
#include "source.h"
#include "value.h"

/* Largest working precision of reals, in decimal digits (`precision D`, `--precision D`): as for
   decimal(), more would take minutes per function. */
#define REAL_MAX_DIGITS 100000

/* Guards against requests that would exhaust memory or run for hours; each
   has a command-line option to raise it. */
typedef struct interp_limits {
    double max_terms;      /* correlator terms of one integral (--max-terms) */
    double max_table;      /* memo entries of the correlator table, values of a list (--max-table) */
    slong max_class_terms; /* monomials of an expanded class expression */
    slong max_dim;         /* largest dimension 3g-3+n accepted */
    int max_depth;         /* nesting of user-function calls (--max-depth) */
    double max_seconds;    /* predicted running time of one request (--max-seconds) */
} interp_limits;

typedef struct interp {
    scalar_ring ring;
    scope *globals;
    wk_table *wk;            /* Witten-Kontsevich numbers computed so far */
    struct wk_kdv_table *wk_kdv; /* the same by the KdV recursion (--verify), created on first use */
    struct hodge_ctx *hodge; /* Hodge integrals computed so far (hodge_lang.c), created on first use */
    keymap integrals;        /* psi-kappa integrals computed so far */
    struct theta_table *theta_vir, *theta_kdv; /* Theta-psi numbers by two routes (theta_lang.c) */
    interp_limits lim;
    int depth;               /* current user-function call depth */
    double list_outer;       /* values that the seq lists being built hold per item of a new one (1 outside seq) */
    int explain_all;         /* print the reduction of every integral */
    struct volume_cache *volcache; /* volume polynomials asked so far (volume_cache.c) */
    slong real_digits;       /* working precision (decimal digits) of reals made by functions (precision D,
                                --precision D; 1 to REAL_MAX_DIGITS) */
    out_style style;
    fmpq *wpv;               /* normalised volumes V_{g,n}, g <= wpv_G, n <= wpv_N (fastvol.c) */
    slong wpv_G, wpv_N;
    int route_volumes;       /* send every recognised volume integral to the volume engine */
    int verify;              /* recompute by a second, independent route and compare (--verify: 1;
                                --verify=strict: 2, anything unchecked is an error) */
    struct verify_account *vacct; /* what --verify checked (verify_account.c) */
    struct store *store;     /* results store, opened on first use (results.c) */
    char *store_path;        /* --store PATH (owned), NULL for the default */
    int store_off;           /* --no-store, or the store could not be opened */
    int store_always;        /* store every answer, however cheap (tests) */         /* how values print (output statement, --format, --digits) */
    FILE *out;               /* the record being printed (sink_stream(&sink)) */
    sink sink;               /* standard output, written a whole record at a time */
    node_list **programs;    /* kept alive: function bodies point into them */
    source **sources;
    int nprograms;
    char **search;           /* --lib folders for load */
    int nsearch;
    char **loading;          /* canonical paths of scripts being loaded (a stack) */
    char **loading_names;    /* the same scripts as their paths were written, for messages */
    int nloading;
    char **loaded;           /* scripts already loaded, not loaded again */
    int nloaded;
    const node **warned;     /* integrals that have warned about their integrand (once each) */
    int nwarned;
} interp;

void interp_init(interp *I);
/* Routes FLINT's abort hook to the statement being run (call once). */
void interp_install_abort_handler(void);
void interp_clear(interp *I);

/* Parses and runs src (taking ownership of it). Returns 0 when every
   statement ran, 1 after reporting the first error; statements before the
   error have printed their results. */
int interp_run_source(interp *I, source *src);

/* Adds a folder to the search path of load (copied). */
void interp_add_search_dir(interp *I, const char *dir);

#endif
