#include "class_expand.h"

#include "diag.h"
#include "eval.h"
#include "failure.h"

int class_expand_reported(cpoly *P, const node *where, const cx *c)
{
    const cx *bad = NULL;
    int rc = cpoly_expand(P, c, &bad);
    const node *at = bad && bad->origin ? bad->origin : where;
    switch (rc) {
    case CPOLY_OK:
        return 1;
    case CPOLY_PSI_RANGE:
        diag_error(&at->loc, "psi_%ld does not exist on Mbar_{%ld,%ld} (its points are numbered 1..%ld)",
                   (long)bad->index, (long)P->g, (long)P->n, (long)P->n);
        break;
    case CPOLY_EXP_CONSTANT:
        diag_error(&at->loc, "exp() of a class with a nonzero degree-0 part has no exact value here; "
                             "take the constant factor out");
        break;
    case CPOLY_TOO_DEEP:
        diag_error(&where->loc, "this class expression is nested too deeply to expand (build it with fewer "
                                "nested sums, e.g. sum_{i=a..b} inside one integral)");
        break;
    case CPOLY_CANCELLED:
        failure_cancelled(where);
        break;
    case CPOLY_TOO_BIG:
        diag_error(&at->loc, "expanding this class on Mbar_{%ld,%ld} needs more than %ld terms "
                             "(raise the limit with --max-terms N)",
                   (long)P->g, (long)P->n, (long)P->max_terms);
        break;
    default:   /* CPOLY_THETA, CPOLY_HODGE: a class of another family where this route cannot take it */
        diag_error(&at->loc, "this class cannot be expanded here (a class of another family in this integrand)");
        break;
    }
    return 0;
}
