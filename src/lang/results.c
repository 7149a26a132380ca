/* The results store seen from the evaluator: answers to expensive questions
   (integrals of class expressions) are kept in an embedded database keyed by
   the engine version and a hash of the complete question (results_key.h), so
   that a script run again gets them back at once. The store is opened on
   first use; --no-store (or PSIKAPPA_STORE=off) turns it off and --store PATH
   moves it. */
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "cancel.h"
#include "diag.h"
#include "engine_version.h"
#include "print.h"
#include "interp.h"
#include "results_key.h"
#include "store.h"
#include "util.h"
#include "results.h"

/* The store keeps answers under the engines' version and the program's, so
   that old answers are never reused and no release reads another's. */
#ifndef PSIKAPPA_PROGRAM_VERSION
#define PSIKAPPA_PROGRAM_VERSION "unknown"
#endif
#define RESULTS_STORE_VERSION RESULTS_ENGINE_VERSION "/" PSIKAPPA_PROGRAM_VERSION

/* Answers computed faster than this are not worth a database write. */
#define RESULTS_MIN_SECONDS 0.05

/* Labels (for people reading the file) are printed only for small classes. */
#define RESULTS_LABEL_NODES 200
#define RESULTS_LABEL_CHARS 200

/* Reports what the store has to say (damage, failed writes) as a note. */
static void results_report(interp *I)
{
    char *note = store_take_note(I->store);
    if (note)
        diag_note(NULL, "%s", note);
    free(note);
}

static store *results_open(interp *I)
{
    if (I->store_off || I->store)
        return I->store;
    char buf[4096];
    const char *path = I->store_path ? I->store_path : store_default_path(buf, sizeof buf);
    char *err = NULL;
    I->store = path ? store_open(path, RESULTS_STORE_VERSION, &err) : NULL;
    if (err)
        diag_note(NULL, "%s", err);
    free(err);
    if (!I->store)
        I->store_off = 1;
    return I->store;
}

/* Whether the class, written out as a tree, has at most `budget` nodes (a
   small expression can stand for a huge tree when parts are shared). */
static int results_tree_small(const cx *e, slong *budget)
{
    for (; e; e = e->kind == CX_SCALAR ? NULL : e->a) {
        if (--*budget < 0)
            return 0;
        if (e->kind != CX_SCALAR && e->b && !results_tree_small(e->b, budget))
            return 0;
    }
    return 1;
}

int results_question_integral(interp *I, slong g, slong n, const cx *e, results_question *q)
{
    memset(q, 0, sizeof *q);
    if (I->store_off || !results_key_integral(&I->ring, g, n, e, q->key))
        return 0;
    slong budget = RESULTS_LABEL_NODES;
    if (results_tree_small(e, &budget)) {
        char *c = print_class(e, &I->ring);
        q->label = xasprintf("int_{%ld,%ld} %.*s", (long)g, (long)n, RESULTS_LABEL_CHARS, c);
        free(c);
    } else {
        q->label = xasprintf("int_{%ld,%ld} (a class of %ld nodes)", (long)g, (long)n, (long)results_key_last_nodes());
    }
    return 1;
}

void results_question_clear(results_question *q)
{
    free(q->label);
    q->label = NULL;
}

int results_lookup(interp *I, const results_question *q, fmpq_mpoly_t out)
{
    if (cancel_flag)   /* the time is up: no wait on the store's lock either */
        return 0;
    store *S = results_open(I);
    char *answer = NULL;
    int hit = S && store_get(S, q->key, &answer) == 1;
    results_report(I);
    int ok = hit && scalar_deserialise(out, answer, &I->ring);
    free(answer);
    return ok;
}

void results_save(interp *I, const results_question *q, const fmpq_mpoly_t value, double seconds)
{
    if ((seconds < RESULTS_MIN_SECONDS && !I->store_always) || cancel_flag)
        return;
    store *S = results_open(I);
    if (!S)
        return;
    char *text = scalar_serialise(value, &I->ring);
    store_put(S, q->key, q->label, text);
    free(text);
    results_report(I);
}

int results_lookup_text(interp *I, const char *key, char **answer)
{
    *answer = NULL;
    if (cancel_flag)
        return 0;
    store *S = results_open(I);
    int hit = S && store_get(S, key, answer) == 1;
    results_report(I);
    return hit;
}

int results_save_text(interp *I, const char *key, const char *label, const char *text, double seconds)
{
    if ((seconds < RESULTS_MIN_SECONDS && !I->store_always) || cancel_flag)
        return 0;
    store *S = results_open(I);
    int ok = S && store_put(S, key, label, text);
    results_report(I);
    return ok;
}

int results_begin(interp *I)
{
    return store_begin(results_open(I));
}

void results_end(interp *I)
{
    store_end(I->store);
    results_report(I);
}

double results_clock(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

void results_close(interp *I)
{
    if (I->store)
        store_close(I->store);
    I->store = NULL;
}
