/* sgraph_print.c - the printed form of a stable graph: vertices numbered from 1 in canonical
 * order, each as g<genus>{<legs>} (no braces without legs), then the edges as v-w (a loop is v-v), e.g. the graph of
 * Mbar_{1,2} with two vertices joined by two edges: [g0{1} g0{2} | 1-2 1-2].
 */
#include <stdio.h>

#include "sgraph.h"

/* Appends formatted text at *len, keeping buf NUL-terminated within sz. */
static void put(char *buf, slong sz, slong *len, const char *s)
{
    for (; *s; s++, (*len)++)
        if (*len + 1 < sz)
            buf[*len] = *s, buf[*len + 1] = '\0';
}

slong sgraph_snprint(char *buf, slong sz, const sgraph *G)
{
    slong len = 0;
    char t[32];
    if (sz > 0)
        buf[0] = '\0';
    put(buf, sz, &len, "[");
    for (int v = 0; v < G->nv; v++) {
        int first = 1;
        snprintf(t, sizeof t, "%sg%d", v ? " " : "", G->gv[v]);
        put(buf, sz, &len, t);
        for (int i = 0; i < G->n; i++)
            if (G->legv[i] == v) {
                snprintf(t, sizeof t, "%s%d", first ? "{" : ",", i + 1);
                put(buf, sz, &len, t);
                first = 0;
            }
        if (!first)
            put(buf, sz, &len, "}");
    }
    if (G->ne > 0)
        put(buf, sz, &len, " |");
    for (int v = 0; v < G->nv; v++)
        for (int w = v; w < G->nv; w++)
            for (int k = 0; k < G->m[v][w]; k++) {
                snprintf(t, sizeof t, " %d-%d", v + 1, w + 1);
                put(buf, sz, &len, t);
            }
    put(buf, sz, &len, "]");
    return len;
}
