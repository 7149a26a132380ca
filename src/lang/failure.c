#include "failure.h"

#include "cancel.h"
#include "diag.h"

int failure_cancelled(const node *n)
{
    if (!cancel_flag)
        return 0;
    diag_error(&n->loc, "%s", cancel_message());
    return 1;
}

void failure_report(const node *where, const char *engine, int rc, int cancelled_code, const failure_words *table)
{
    if (cancel_flag || rc == cancelled_code) {
        if (!failure_cancelled(where))   /* the engine saw a request already cleared */
            diag_error(&where->loc, "%s was interrupted", engine);
        return;
    }
    for (const failure_words *w = table; w && w->text; w++)
        if (w->code == rc) {
            diag_error(&where->loc, "%s", w->text);
            return;
        }
    diag_error(&where->loc, "%s rejected this request (code %d)", engine, rc);
}
