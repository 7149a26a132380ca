/* The names of the Hodge classes: lambda_J, ch_K and their subscript forms lambda_{e}, ch_{e}. */
#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "eval.h"
#include "hodge/hodge.h"
#include "hodge_lang.h"

int hodge_lang_name(interp *I, const node *n, value **out)
{
    const char *t = n->text;
    size_t skip = strncmp(t, "lambda_", 7) == 0 ? 7 : strncmp(t, "ch_", 3) == 0 ? 3 : 0;
    if (skip == 0 || t[skip] == '\0' || strspn(t + skip, "0123456789") != strlen(t + skip))
        return 0;
    *out = NULL;
    while (t[skip] == '0' && t[skip + 1] != '\0')   /* leading zeros: lambda_01 is lambda_1 */
        skip++;
    if (strlen(t + skip) > 6 || atol(t + skip) > HODGE_MAX_INDEX) {
        diag_error(&n->loc, "%s: Hodge class indices go up to %d", t, HODGE_MAX_INDEX);
        return 1;
    }
    slong j = atol(t + skip);
    cx *c = t[0] == 'l' ? cx_lambda(j, I->ring.ctx, n) : cx_ch(j, I->ring.ctx, n);
    *out = value_new_class(c, &I->ring);
    return 1;
}

int hodge_lang_subscript(interp *I, scope *s, const node *n, value **out)
{
    int is_lambda = strcmp(n->text, "lambda") == 0;
    slong j;
    if (!is_lambda && strcmp(n->text, "ch") != 0)
        return 0;
    *out = NULL;
    if (n->list->len != 1) {
        diag_error(&n->loc, "%s_{j} takes one index", n->text);
        return 1;
    }
    const node *idx = n->list->items[0];
    if (!eval_slong(I, s, idx, is_lambda ? "lambda index" : "ch index", 0, &j))
        return 1;
    if (j > HODGE_MAX_INDEX) {
        diag_error(&idx->loc, "%s index %ld: Hodge class indices go up to %d", n->text, (long)j, HODGE_MAX_INDEX);
        return 1;
    }
    cx *c = is_lambda ? cx_lambda(j, I->ring.ctx, n) : cx_ch(j, I->ring.ctx, n);
    *out = value_new_class(c, &I->ring);
    return 1;
}
