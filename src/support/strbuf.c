#include "strbuf.h"

#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "util.h"

void strbuf_init(strbuf *b)
{
    b->cap = 32;
    b->len = 0;
    b->data = xmalloc(b->cap);
    b->data[0] = '\0';
}

void strbuf_clear(strbuf *b)
{
    free(b->data);
    b->data = NULL;
    b->len = b->cap = 0;
}

static void strbuf_reserve(strbuf *b, size_t extra)
{
    if (b->len + extra + 1 <= b->cap)
        return;
    while (b->len + extra + 1 > b->cap)
        b->cap *= 2;
    b->data = xrealloc(b->data, b->cap);
}

void strbuf_putc(strbuf *b, char c)
{
    strbuf_reserve(b, 1);
    b->data[b->len++] = c;
    b->data[b->len] = '\0';
}

void strbuf_puts(strbuf *b, const char *s)
{
    size_t n = strlen(s);
    strbuf_reserve(b, n);
    memcpy(b->data + b->len, s, n + 1);
    b->len += n;
}

void strbuf_printf(strbuf *b, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    int n = vsnprintf(NULL, 0, fmt, ap);
    va_end(ap);
    strbuf_reserve(b, (size_t)n);
    va_start(ap, fmt);
    vsnprintf(b->data + b->len, (size_t)n + 1, fmt, ap);
    va_end(ap);
    b->len += (size_t)n;
}

void strbuf_put_fmpz(strbuf *b, const fmpz_t x)
{
    char *s = fmpz_get_str(NULL, 10, x);
    strbuf_puts(b, s);
    flint_free(s);
}

void strbuf_put_fmpq(strbuf *b, const fmpq_t x)
{
    char *s = fmpq_get_str(NULL, 10, x);
    strbuf_puts(b, s);
    flint_free(s);
}

char *strbuf_take(strbuf *b)
{
    char *s = b->data;
    b->data = NULL;
    b->len = b->cap = 0;
    return s;
}
