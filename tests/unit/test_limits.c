/* test_limits.c - the limits a default run gets.
 *
 * The correlator table of a fresh interpreter must carry the default --max-table limit, so that a
 * computation whose estimate passes but which grows beyond it stops instead of filling memory
 * (the limit was once applied before its default was set, leaving the table unlimited).
 * A request just above that default is refused by its estimate: tests/golden/max_table_default.pk.
 */
#include "interp.h"
#include "unit.h"

static unit_report rep;

int main(void)
{
    interp I;
    interp_init(&I);
    UNIT_CHECK(&rep, I.lim.max_table == 3e7, "default --max-table is 3e7 (docs/psikappa.1), got %g",
               I.lim.max_table);
    UNIT_CHECK(&rep, wk_table_limit(I.wk) == (slong) I.lim.max_table,
               "the correlator table's limit %ld equals --max-table %g", (long) wk_table_limit(I.wk),
               I.lim.max_table);
    interp_clear(&I);
    flint_cleanup();
    return unit_finish("test_limits", &rep);
}
