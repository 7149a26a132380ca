/* The account of --verify (see verify_account.h): counters kept for the whole run, so that the
   end of the run can say what was and was not checked, and why. */
#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "util.h"
#include "verify_account.h"

/* At most this many distinct reasons are told apart; later ones share the last line. */
#define VERIFY_MAX_REASONS 24

typedef struct {
    const char *why;
    verify_unit unit;
    double count;
} verify_reason;

struct verify_account {
    double checked[2], unchecked[2], zero;
    verify_reason reasons[VERIFY_MAX_REASONS];
    int nreasons;
    int second_depth;       /* > 0 inside a second route */
};

/* The interpreter's account, made on first use (never NULL: xcalloc exits on exhaustion). */
static struct verify_account *verify_get(interp *I)
{
    if (!I->vacct)
        I->vacct = xcalloc(1, sizeof(struct verify_account));
    return I->vacct;
}

void verify_checked(interp *I, verify_unit u, double count)
{
    struct verify_account *A = verify_get(I);
    if (A->second_depth == 0)
        A->checked[u] += count;
}

/* Adds count to the line of (why, u), opening one if there is room. */
static void verify_add_reason(struct verify_account *A, verify_unit u, double count, const char *why)
{
    int i;
    for (i = 0; i < A->nreasons; i++)
        if (A->reasons[i].unit == u && strcmp(A->reasons[i].why, why) == 0)
            break;
    if (i == A->nreasons && A->nreasons < VERIFY_MAX_REASONS) {
        A->reasons[i].why = why;
        A->reasons[i].unit = u;
        A->reasons[i].count = 0;
        A->nreasons++;
    } else if (i == A->nreasons) {
        i = A->nreasons - 1;
    }
    A->reasons[i].count += count;
}

int verify_unchecked(interp *I, const node *where, verify_unit u, double count, const char *why)
{
    struct verify_account *A = verify_get(I);
    if (A->second_depth > 0 || count <= 0)
        return 1;
    A->unchecked[u] += count;
    verify_add_reason(A, u, count, why);
    if (u != VERIFY_VALUE || I->verify < 2)
        return 1;
    diag_error(&where->loc, "--verify=strict: this value was not checked by a second route: %s", why);
    return 0;
}

value *verify_unchecked_value(interp *I, const node *where, value *v, const char *why)
{
    if (v && !verify_unchecked(I, where, VERIFY_VALUE, 1, why)) {
        value_release(v);
        return NULL;
    }
    return v;
}

void verify_no_check_needed(interp *I)
{
    struct verify_account *A = verify_get(I);
    if (A->second_depth == 0)
        A->zero++;
}

void verify_second_begin(interp *I)
{
    verify_get(I)->second_depth++;
}

void verify_second_end(interp *I)
{
    verify_get(I)->second_depth--;
}

/* "1 value" / "3 monomials". */
static void verify_print_count(FILE *f, double count, verify_unit u)
{
    static const char *names[2][2] = {{"value", "values"}, {"monomial", "monomials"}};
    fprintf(f, "%.0f %s", count, names[u][count != 1]);
}

void verify_print(const interp *I, FILE *f)
{
    static const struct verify_account none;
    const struct verify_account *A = I->vacct ? I->vacct : &none;
    if (!I->verify)
        return;
    fprintf(f, "verify: %.0f of %.0f value%s checked by a second route", A->checked[0],
            A->checked[0] + A->unchecked[0], A->checked[0] + A->unchecked[0] == 1 ? "" : "s");
    if (A->checked[1] + A->unchecked[1] > 0)
        fprintf(f, ", and %.0f of %.0f monomial%s of their reductions", A->checked[1],
                A->checked[1] + A->unchecked[1], A->checked[1] + A->unchecked[1] == 1 ? "" : "s");
    if (A->zero > 0)
        fprintf(f, "; %.0f value%s 0 by the degree alone (nothing to check)", A->zero, A->zero == 1 ? " is" : "s are");
    fputc('\n', f);
    for (int i = 0; i < A->nreasons; i++) {
        fputs("  not checked: ", f);
        verify_print_count(f, A->reasons[i].count, A->reasons[i].unit);
        fprintf(f, ": %s%s\n", A->reasons[i].why,
                i == VERIFY_MAX_REASONS - 1 && A->nreasons == VERIFY_MAX_REASONS ? " (and other reasons)" : "");
    }
}

void verify_account_free(interp *I)
{
    free(I->vacct);
    I->vacct = NULL;
}
