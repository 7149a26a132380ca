#include "cxsize.h"

#include <stdint.h>
#include <stdlib.h>

#include "util.h"

/* Open-addressing map from a node to its tree size (0: not known yet). */
typedef struct {
    const cx **node;
    double *size;
    size_t mask, len;
} cxsize_map;

static size_t cxsize_slot(const cxsize_map *M, const cx *e)
{
    size_t h = ((size_t)(uintptr_t)e >> 4) * (size_t)0x9E3779B97F4A7C15ull;
    for (h &= M->mask; M->node[h] && M->node[h] != e; h = (h + 1) & M->mask)
        ;
    return h;
}

static void cxsize_grow(cxsize_map *M)
{
    cxsize_map N = {xcalloc(2 * (M->mask + 1), sizeof(cx *)), xcalloc(2 * (M->mask + 1), sizeof(double)),
                    2 * (M->mask + 1) - 1, M->len};
    for (size_t i = 0; i <= M->mask; i++)
        if (M->node[i]) {
            size_t s = cxsize_slot(&N, M->node[i]);
            N.node[s] = M->node[i];
            N.size[s] = M->size[i];
        }
    free(M->node);
    free(M->size);
    *M = N;
}

static double cxsize_get(const cxsize_map *M, const cx *e)
{
    size_t s = cxsize_slot(M, e);
    return M->node[s] ? M->size[s] : 0.0;
}

static void cxsize_put(cxsize_map *M, const cx *e, double size)
{
    if (2 * (M->len + 1) > M->mask + 1)
        cxsize_grow(M);
    size_t s = cxsize_slot(M, e);
    if (!M->node[s])
        M->len++;
    M->node[s] = e;
    M->size[s] = size;
}

/* The children of e that count (a scalar node has none). */
static void cxsize_children(const cx *e, const cx *kids[2])
{
    kids[0] = e->kind == CX_SCALAR ? NULL : e->a;
    kids[1] = e->kind == CX_SCALAR ? NULL : e->b;
}

double cx_tree_size(const cx *e, double cap)
{
    cxsize_map M = {xcalloc(64, sizeof(cx *)), xcalloc(64, sizeof(double)), 63, 0};
    size_t top = 0, alloc = 64;
    const cx **stack = xmalloc(alloc * sizeof(cx *));
    double result = 0.0;
    stack[top++] = e;
    while (top > 0 && result < cap) {
        const cx *x = stack[top - 1], *kids[2];
        cxsize_children(x, kids);
        int pending = 0;
        for (int i = 0; i < 2; i++)
            if (kids[i] && cxsize_get(&M, kids[i]) == 0.0) {
                if (top + 1 >= alloc)
                    stack = xrealloc(stack, (alloc *= 2) * sizeof(cx *));
                stack[top++] = kids[i];
                pending = 1;
            }
        if (pending)
            continue;
        double s = 1.0;
        for (int i = 0; i < 2; i++)
            s += kids[i] ? cxsize_get(&M, kids[i]) : 0.0;
        if (s > cap)
            s = cap;
        cxsize_put(&M, x, s);
        top--;
        if (x == e || s >= cap)
            result = s;
    }
    free(stack);
    free(M.node);
    free(M.size);
    return result < cap ? result : cap;
}
