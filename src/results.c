/* The results store seen from the evaluator: answers to expensive questions
   (integrals, specialisations) are kept in an embedded database keyed by the
   engine version and the exact question, so that a script run again gets them
   back at once. The store is opened on first use; --no-store (or
   PSIKAPPA_STORE=off) turns it off and --store PATH moves it. */
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "cancel.h"
#include "diag.h"
#include "interp.h"
#include "store.h"
#include "util.h"

/* Bumped whenever a change could alter an answer, so old answers are never reused. */
#define RESULTS_ENGINE_VERSION "psikappa-engine-1"

/* Answers computed faster than this are not worth a database write. */
#define RESULTS_MIN_SECONDS 0.05

static store *results_open(interp *I)
{
    if (I->store_off || I->store)
        return I->store;
    char buf[4096];
    const char *path = I->store_path ? I->store_path : store_default_path(buf, sizeof buf);
    char *err = NULL;
    I->store = path ? store_open(path, RESULTS_ENGINE_VERSION, &err) : NULL;
    if (err)
        diag_note(NULL, "results store: %s", err);
    free(err);
    if (!I->store)
        I->store_off = 1;
    return I->store;
}

int results_lookup(interp *I, const char *question, fmpq_mpoly_t out)
{
    if (cancel_flag)   /* the time is up: no wait on the store's lock either */
        return 0;
    store *S = results_open(I);
    char *answer = NULL;
    if (!S || store_get(S, question, &answer) != 1)
        return 0;
    int ok = scalar_deserialise(out, answer, &I->ring);
    free(answer);
    return ok;
}

void results_save(interp *I, const char *question, const fmpq_mpoly_t value, double seconds)
{
    if ((seconds < RESULTS_MIN_SECONDS && !I->store_always) || cancel_flag)
        return;
    store *S = results_open(I);
    if (!S)
        return;
    char *text = scalar_serialise(value, &I->ring);
    store_put(S, question, text);
    free(text);
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
