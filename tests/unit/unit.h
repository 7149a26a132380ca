/* unit.h - minimal shared helpers for the psikappa unit tests (header-only, test code only).
 *
 * Each test program keeps one unit_report, records checks with UNIT_CHECK (which prints the
 * failing input via a printf-style message), and ends with unit_finish, which prints
 * "N passed, N failed" and yields the process exit status.  Randomised loop counts are scaled by
 * the environment variable PSIKAPPA_TEST_MULTIPLIER (a positive real, default 1).
 */
#ifndef PSIKAPPA_TESTS_UNIT_H
#define PSIKAPPA_TESTS_UNIT_H

#include <stdio.h>
#include <stdlib.h>
#include <flint/fmpq.h>

typedef struct {
    long passed, failed;
} unit_report;

/* Records one check; on failure prints file:line and the formatted description of the input. */
#define UNIT_CHECK(rep, cond, ...)                                          \
    do {                                                                    \
        if (cond) {                                                         \
            (rep)->passed++;                                                \
        } else {                                                            \
            (rep)->failed++;                                                \
            fprintf(stderr, "FAIL %s:%d: ", __FILE__, __LINE__);            \
            fprintf(stderr, __VA_ARGS__);                                   \
            fprintf(stderr, "\n");                                          \
        }                                                                   \
    } while (0)

/* Number of iterations for a randomised loop: base scaled by PSIKAPPA_TEST_MULTIPLIER, at least 1.
   Invalid or non-positive multipliers are ignored so that a test can never silently run nothing. */
static inline long unit_iterations(long base)
{
    const char *s = getenv("PSIKAPPA_TEST_MULTIPLIER");
    double m = 1.0, r;
    if (s != NULL) {
        char *end;
        double v = strtod(s, &end);
        if (end != s && v > 0.0)
            m = v;
    }
    r = (double) base * m;
    return r < 1.0 ? 1 : (long) (r + 0.5);
}

/* Prints a rational to stderr (used inside failure messages' follow-up lines). */
static inline void unit_print_fmpq(const char *label, const fmpq_t x)
{
    fprintf(stderr, "    %s = ", label);
    fmpq_fprint(stderr, x);
    fprintf(stderr, "\n");
}

/* Exit status of a test program that could not run on this machine (CTest's
   SKIP_RETURN_CODE for every unit test): it is reported as skipped, not passed. */
#define UNIT_SKIPPED 77

/* Prints the summary line and returns the exit status: nonzero when a check
   failed, and also when none was made, since a test that checks nothing is a
   defect, not a pass. */
static inline int unit_finish(const char *name, const unit_report *rep)
{
    printf("%s: %ld passed, %ld failed\n", name, rep->passed, rep->failed);
    if (rep->passed + rep->failed == 0) {
        printf("%s: no check was made\n", name);
        return 1;
    }
    return rep->failed != 0;
}

#endif
