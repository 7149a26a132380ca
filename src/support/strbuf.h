/* A growable string buffer for building output text. */
#ifndef PSIKAPPA_STRBUF_H
#define PSIKAPPA_STRBUF_H

#include <stddef.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>

typedef struct strbuf {
    char *data;  /* always NUL-terminated */
    size_t len, cap;
} strbuf;

void strbuf_init(strbuf *b);
void strbuf_clear(strbuf *b);
void strbuf_putc(strbuf *b, char c);
void strbuf_puts(strbuf *b, const char *s);
void strbuf_printf(strbuf *b, const char *fmt, ...) __attribute__((format(printf, 2, 3)));
void strbuf_put_fmpz(strbuf *b, const fmpz_t x);
void strbuf_put_fmpq(strbuf *b, const fmpq_t x);
/* Hands the text to the caller (who frees it) and leaves b empty. */
char *strbuf_take(strbuf *b);

#endif
