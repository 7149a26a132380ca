#include "reduction_cost.h"

#include "diag.h"

/* Predicted seconds of the reduction route: about 3 microseconds per table entry (DVV steps on
   numbers that grow with the genus; measured 1-2.5 us for g = 10..12 with 1.5e5..2.9e6 entries)
   and 1 microsecond per correlator term of the pushforward sum. */
double reduction_seconds(double entries, double terms)
{
    return 3e-6 * entries + 1e-6 * terms;
}

/* Refuses, before any work, a reduction predicted to run longer than --max-seconds. */
int reduction_seconds_ok(interp *I, const node *where, double entries, double terms)
{
    double sec = reduction_seconds(entries, terms);
    if (sec <= I->lim.max_seconds)
        return 1;
    diag_error(&where->loc, "this computation needs about %.3g s (%.3g correlator table entries, %.3g reduction "
                            "terms), above the limit of %g s (raise it with --max-seconds S)",
               sec, entries, terms, I->lim.max_seconds);
    return 0;
}
