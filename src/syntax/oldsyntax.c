#include "oldsyntax.h"

#include <stdio.h>
#include <string.h>

#include "strbuf.h"

/* Old forms longer than this are named in general terms, not quoted. */
#define OLDSYNTAX_MAX_QUOTE 60

typedef struct {
    const char *kw;
    const char *usage;   /* the new form in general terms */
    const char *what;    /* what the word begins */
} oldsyntax_word;

static const oldsyntax_word oldsyntax_words[] = {
    {"int", "int_{g,n} E", "an integral over Mbar_{g,n}"},
    {"sum", "sum_{i=a..b} E", "a sum"},
    {"prod", "prod_{i=a..b} E", "a product"},
    {"seq", "seq_{i=a..b} E", "a list"},
    {"table", "table_{g=a..b, n=c..d} E", "a table"},
    {"F", "F_{g} with ... (F_2 with ... for a number)", "a specialisation of F_g"},
    {"psi", "psi_1, or psi_{e} for a computed index", "a psi class"},
    {"kappa", "kappa_1, or kappa_{e} for a computed index", "a kappa class"},
    {"tau", "tau_2, or tau_{e} for a computed index", "an insertion of a correlator"},
};

/* Length of the bracket that opens at s ("[...]", brackets balanced, on one
   line), including both brackets; 0 when it does not close there. */
static size_t oldsyntax_bracket_len(const char *s)
{
    int depth = 0;
    for (size_t i = 0; s[i] && s[i] != '\n' && i <= OLDSYNTAX_MAX_QUOTE; i++) {
        if (s[i] == '[' || s[i] == '(')
            depth++;
        else if ((s[i] == ']' || s[i] == ')') && --depth == 0)
            return s[i] == ']' ? i + 1 : 0;
    }
    return 0;
}

static int oldsyntax_all_digits(const char *s, size_t len)
{
    if (len == 0)
        return 0;
    for (size_t i = 0; i < len; i++)
        if (s[i] < '0' || s[i] > '9')
            return 0;
    return 1;
}

/* Copies the inside of a bracket in the new style: no blanks around '=' in
   iterator heads (sum_{i=1..n}), none around ',' in the subscripts of int. */
static void oldsyntax_copy_inside(strbuf *b, const char *in, size_t len, int tight_comma)
{
    int depth = 0;
    for (size_t i = 0; i < len; i++) {
        char c = in[i];
        depth += c == '(' || c == '[';
        depth -= c == ')' || c == ']';
        int tight = depth == 0 && (c == '=' || (tight_comma && c == ','));
        if (tight) {
            while (b->len > 0 && b->data[b->len - 1] == ' ')
                b->data[--b->len] = '\0';
            strbuf_putc(b, c);
            while (i + 1 < len && in[i + 1] == ' ')
                i++;
        } else {
            strbuf_putc(b, c);
        }
    }
}

/* "kw[inside] is written kw_{inside}" (or kw_N for a number). */
static void oldsyntax_quote(strbuf *b, const char *kw, const char *bracket, size_t blen)
{
    const char *in = bracket + 1;
    size_t len = blen - 2;
    while (len > 0 && *in == ' ') {
        in++;
        len--;
    }
    while (len > 0 && in[len - 1] == ' ')
        len--;
    strbuf_printf(b, "%s%.*s is written %s_", kw, (int)blen, bracket, kw);
    int subscript = strcmp(kw, "F") == 0 || strcmp(kw, "psi") == 0 || strcmp(kw, "kappa") == 0
                    || strcmp(kw, "tau") == 0;
    if (subscript && oldsyntax_all_digits(in, len)) {
        strbuf_printf(b, "%.*s", (int)len, in);
        return;
    }
    strbuf_putc(b, '{');
    oldsyntax_copy_inside(b, in, len, strcmp(kw, "int") == 0);
    strbuf_putc(b, '}');
    if (strcmp(kw, "F") == 0)
        strbuf_puts(b, " with ...");
}

void oldsyntax_keyword(const char *kw, const char *rest, char *buf, size_t size)
{
    const oldsyntax_word *w = &oldsyntax_words[0];
    for (size_t i = 0; i < sizeof oldsyntax_words / sizeof oldsyntax_words[0]; i++)
        if (strcmp(oldsyntax_words[i].kw, kw) == 0)
            w = &oldsyntax_words[i];
    size_t skip = strspn(rest, " \t");
    strbuf b;
    strbuf_init(&b);
    if (rest[skip] == '[') {
        size_t blen = oldsyntax_bracket_len(rest + skip);
        if (blen > 0)
            oldsyntax_quote(&b, kw, rest + skip, blen);
        else
            strbuf_printf(&b, "%s[...] is written %s", kw, w->usage);
    } else {
        strbuf_printf(&b, "'%s' is a reserved word: it begins %s, written %s", kw, w->what, w->usage);
    }
    snprintf(buf, size, "%s", b.data);
    strbuf_clear(&b);
}

const char *oldsyntax_renamed_function(const char *name)
{
    if (strcmp(name, "wpvolume") == 0)
        return "wpvolume(g, n) is written V_{g,n} (the volume polynomial V_{g,n}(L_1..L_n))";
    return NULL;
}
