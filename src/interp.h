/* The interpreter: global state, limits, and running programs. */
#ifndef PSIKAPPA_INTERP_H
#define PSIKAPPA_INTERP_H

#include <setjmp.h>
#include <stdio.h>

#include "ast.h"
#include "correlators/wk.h"
#include "env.h"
#include "format/output.h"
#include "keymap.h"
#include "scalar.h"
#include "sink.h"
#include "source.h"
#include "value.h"

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
    slong real_digits;       /* working precision (decimal digits) of reals made by functions (precision D) */
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
/* Volume integrals by the fast engine (fastvol.c). fastvol_try sets *handled
   when it recognised the integrand (the result is then NULL after an error). */
value *fastvol_try(interp *I, const node *where, slong g, slong n, const value *integrand, int *handled);
int fastvol_get(interp *I, const node *where, fmpq_t v, slong g, slong n);
void fastvol_clear(interp *I);
/* V_{g,n} by the polynomial engine when the reduction would be large
   (or route_volumes is set); *handled as for fastvol_try. */
value *fastvol_try_polynomial(interp *I, const node *where, slong g, slong n, int *handled);

/* The results store (results.c). A question is identified by the hash of its
   complete canonical form (results_key.h); label is a short text for people
   reading the file (owned). results_question_integral returns 0 when the store
   is off or no key can be formed: the answer is then neither looked up nor
   stored. lookup returns 1 and sets out on a hit. */
typedef struct results_question {
    char key[65];
    char *label;
} results_question;
int results_question_integral(interp *I, slong g, slong n, const cx *e, results_question *q);
void results_question_clear(results_question *q);
int results_lookup(interp *I, const results_question *q, fmpq_mpoly_t out);
void results_save(interp *I, const results_question *q, const fmpq_mpoly_t value, double seconds);
double results_clock(void);
void results_close(interp *I);

/* table_{...} E, output FORMAT [digits] and precision DIGITS (exec_table.c). */
int exec_table(interp *I, scope *s, const node *n);
int exec_output(interp *I, scope *s, const node *n);
int exec_precision(interp *I, scope *s, const node *n);

/* load "file" (load.c). */
int exec_load(interp *I, const node *n);

/* Reports a pending interrupt or timeout at n and returns 1; 0 when none. */
int eval_cancelled(const node *n);

/* Names, items of lists, subscripted names L_{i} and V_{g,n} (eval_names.c). */
value *eval_name(interp *I, scope *s, const node *n);
value *eval_indexed(interp *I, scope *s, const node *n);
value *eval_subscript(interp *I, scope *s, const node *n);
/* Reports a name reserved for a class that is not available (unavailable.h)
   at `at`; 1 when name is one. */
int names_check_reserved(const srcloc *at, const char *name);

/* Evaluation entry points shared by the statement executor and builtins. */
value *eval_expr(interp *I, scope *s, const node *n);
/* Evaluates n as an integer >= lo; reports an error naming `what` otherwise. */
int eval_slong(interp *I, scope *s, const node *n, const char *what, slong lo, slong *out);
int exec_stmt(interp *I, scope *s, const node *n);
/* Evaluates n as a condition (a number; nonzero is true); 0 after an error. */
int eval_truth(interp *I, scope *s, const node *n, int *truth);

/* Whether int_{g,n} of integrand is 0 because no term has degree 3g-3+n,
   saying so once per integral `where` (integrand_check.c); it also warns once
   about a formal variable added to a class, which contributes 0. */
int integrand_is_zero(interp *I, const node *where, slong g, slong n, const value *integrand);

/* int_{g,n} of a value (integrate.c). `where` locates errors. */
value *integrate_value(interp *I, const node *where, slong g, slong n, const value *integrand);
/* Prints the psi-only reduction of int_{g,n} integrand, then its value. */
int integrate_explain(interp *I, const node *where, slong g, slong n, const value *integrand);
/* V_{g,n}(L_1..L_n) in Mirzakhani's normalisation, declaring L_1..L_n. */
value *integrate_volume(interp *I, const node *where, slong g, slong n);
/* The same, kept for the run and in the results store (volume_cache.c); new reference. */
value *volume_cached(interp *I, const node *where, slong g, slong n);
void volume_cache_clear(interp *I);
/* Declares the formal variables L_1..L_n, their ring indices into vars[0..n);
   returns 0 after reporting an error at where. */
int integrate_declare_lengths(interp *I, const node *where, slong n, int *vars);
/* --verify: compares the reference result slow (NULL: out of reach, nothing to compare) with
   the engine's fast. Takes both references; returns fast, or NULL after reporting. */
value *integrate_compare_routes(interp *I, const node *where, value *slow, value *fast);
/* <tau_d>_g with the same limits and messages as integrals. */
value *integrate_correlator(interp *I, const node *where, slong g, const slong *d, slong n);

/* F_{g} with ..., order x^N (specialise.c): the series, or its plan printed. */
value *specialise_value(interp *I, scope *s, const node *n);
int specialise_explain(interp *I, scope *s, const node *n);

/* Builtin functions (builtins.c): returns 1 and sets *result when name is a
   builtin (result NULL after an error was reported), 0 when it is not. */
int builtin_call(interp *I, scope *s, const node *call, value **result);

#endif
