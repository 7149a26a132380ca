/* svgplot(path, series, options): writes a self-contained SVG picture of
   one or more sequences against n or against 1/n (where extrapolation to
   n = infinity is the value at 0), with axes, tick labels and a legend. */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "arb_compat.h"
#include "builtins.h"
#include "util.h"

/* toolkit_numeric.c */
#include "scalar_arb.h"

#define SVG_W 720
#define SVG_H 440
#define SVG_LEFT 80    /* room for the y tick labels */
#define SVG_RIGHT 190  /* room for the legend */
#define SVG_TOP 20
#define SVG_BOTTOM 56  /* x tick labels and the axis name */
#define SVG_MAX_SERIES 64
#define SVG_MAX_POINTS 100000
#define SVG_MARKS_UPTO 200 /* beyond this many points, markers only clutter */

typedef struct {
    slong len;
    double *y;  /* owned */
    char *name; /* owned, plain text (escaped when written) */
} svg_series;

typedef struct {
    int inverse; /* x = 1/n instead of n */
    slong n0;    /* index n of the first item of every series */
    slong ns;
    svg_series *s; /* owned */
    double xlo, xhi, ylo, yhi, xstep, ystep;
} svg_plot;

static const char *const svg_colours[] = {"#1f5fbf", "#d2461e", "#2a9a3a", "#8a3fb0",
                                          "#c89200", "#17a2b8", "#b03060", "#555555"};

/* Prepares an empty plot; pairs with svg_plot_clear. */
static void svg_plot_init(svg_plot *P)
{
    memset(P, 0, sizeof *P);
    P->n0 = 1;
}

static void svg_plot_clear(svg_plot *P)
{
    for (slong i = 0; i < P->ns; i++) {
        free(P->s[i].y);
        free(P->s[i].name);
    }
    free(P->s);
}

/* Converts the numbers of list v (Q[pi] only) to doubles in S.
   Returns NULL or a new error message naming the bad item. */
static char *svg_series_read(svg_series *S, const value *v, slong which, const scalar_ring *R)
{
    if (v->len < 1 || v->len > SVG_MAX_POINTS)
        return xasprintf("series %ld has %ld items (1 to %d can be plotted)", (long)which, (long)v->len, SVG_MAX_POINTS);
    S->len = v->len;
    S->y = xcalloc((size_t)v->len, sizeof(double));
    arb_t t;
    arb_init(t);
    char *err = NULL;
    for (slong j = 0; j < v->len && !err; j++) {
        const value *it = v->items[j];
        if (it->kind != V_NUM || !scalar_is_pi_only(it->num, R)) {
            err = xasprintf("item %ld of series %ld is not a number in Q[pi]", (long)(j + 1), (long)which);
            break;
        }
        scalar_get_arb(t, it->num, R, 64);
        S->y[j] = arf_get_d(arb_midref(t), ARF_RND_NEAR);
        if (!isfinite(S->y[j]) || fabs(S->y[j]) > 1e300)
            err = xasprintf("item %ld of series %ld is too large to plot", (long)(j + 1), (long)which);
    }
    arb_clear(t);
    return err;
}

/* Reads the series argument: a list of numbers (one series) or a list of
   lists (several). Returns NULL or a new error message. */
static char *svg_read_series(svg_plot *P, const value *data, const scalar_ring *R)
{
    if (data->kind != V_LIST || data->len == 0)
        return xstrdup("expected a nonempty list of numbers, or a list of such lists");
    int nested = data->items[0]->kind == V_LIST;
    P->ns = nested ? data->len : 1;
    if (P->ns > SVG_MAX_SERIES)
        return xasprintf("at most %d series can be plotted together", SVG_MAX_SERIES);
    P->s = xcalloc((size_t)P->ns, sizeof(svg_series));
    for (slong i = 0; i < P->ns; i++) {
        const value *v = nested ? data->items[i] : data;
        if (v->kind != V_LIST)
            return xasprintf("item %ld is not a list (give either numbers or lists of numbers)", (long)(i + 1));
        P->s[i].name = xasprintf("series %ld", (long)(i + 1));
        char *err = svg_series_read(P->s + i, v, i + 1, R);
        if (err)
            return err;
    }
    return NULL;
}

/* Sets P->inverse from "index" or "inverse"; 0 on any other text. */
static int svg_read_axis(svg_plot *P, const value *v)
{
    if (v->kind != V_STR)
        return 0;
    P->inverse = strcmp(v->str, "inverse") == 0;
    return P->inverse || strcmp(v->str, "index") == 0;
}

/* Replaces the default names by the strings of list v (one per series). */
static char *svg_read_names(svg_plot *P, const value *v)
{
    if (v->kind != V_LIST || v->len != P->ns)
        return xasprintf("the names must be a list of %ld string%s, one per series", (long)P->ns, P->ns == 1 ? "" : "s");
    for (slong i = 0; i < P->ns; i++) {
        if (v->items[i]->kind != V_STR)
            return xasprintf("name %ld is not a string", (long)(i + 1));
        free(P->s[i].name);
        P->s[i].name = xstrdup(v->items[i]->str);
    }
    return NULL;
}

/* Reads the options: "index", "inverse", [axis, n0] or [axis, n0, names].
   Returns NULL or a new error message. */
static char *svg_read_options(svg_plot *P, const value *opt, const scalar_ring *R)
{
    const char *usage = "expected \"index\", \"inverse\", [\"index\" or \"inverse\", n0] or [axis, n0, [names]]";
    if (opt->kind == V_STR)
        return svg_read_axis(P, opt) ? NULL : xstrdup(usage);
    if (opt->kind != V_LIST || opt->len < 1 || opt->len > 3 || !svg_read_axis(P, opt->items[0]))
        return xstrdup(usage);
    if (opt->len >= 2
        && (opt->items[1]->kind != V_NUM || !scalar_get_slong(&P->n0, opt->items[1]->num, R)
            || P->n0 < -1000000000 || P->n0 > 1000000000))
        return xstrdup("n0 (the second option) must be an integer of at most 10^9 in size");
    if (P->inverse && P->n0 < 1)
        return xstrdup("against 1/n the first index n0 must be at least 1");
    return opt->len == 3 ? svg_read_names(P, opt->items[2]) : NULL;
}

/* The abscissa of item j (0-based) of a series. */
static double svg_x(const svg_plot *P, slong j)
{
    double n = (double)(P->n0 + j);
    return P->inverse ? 1.0 / n : n;
}

/* A step of 1, 2 or 5 times a power of ten giving about six ticks on [lo, hi]. */
static double svg_tick_step(double lo, double hi)
{
    double raw = (hi - lo) / 6.0, p = pow(10.0, floor(log10(raw))), m = raw / p;
    return (m < 1.5 ? 1.0 : m < 3.5 ? 2.0 : m < 7.5 ? 5.0 : 10.0) * p;
}

/* Widens [*lo, *hi] to whole tick steps (and to width > 0); sets *step. */
static void svg_axis_fit(double *lo, double *hi, double *step)
{
    if (!(*hi > *lo)) {
        double pad = fabs(*lo) > 0 ? fabs(*lo) * 0.05 : 1.0;
        *lo -= pad;
        *hi += pad;
    }
    *step = svg_tick_step(*lo, *hi);
    *lo = floor(*lo / *step) * *step;
    *hi = ceil(*hi / *step) * *step;
}

/* Sets the ranges of both axes; against 1/n the range includes 0, the limit. */
static void svg_ranges(svg_plot *P)
{
    P->xlo = P->ylo = INFINITY;
    P->xhi = P->yhi = -INFINITY;
    for (slong i = 0; i < P->ns; i++)
        for (slong j = 0; j < P->s[i].len; j++) {
            P->xlo = fmin(P->xlo, svg_x(P, j));
            P->xhi = fmax(P->xhi, svg_x(P, j));
            P->ylo = fmin(P->ylo, P->s[i].y[j]);
            P->yhi = fmax(P->yhi, P->s[i].y[j]);
        }
    if (P->inverse)
        P->xlo = 0.0;
    svg_axis_fit(&P->xlo, &P->xhi, &P->xstep);
    if (!P->inverse && P->xstep < 1.0) { /* indices are integers: no ticks between them */
        P->xstep = 1.0;
        P->xlo = floor(P->xlo);
        P->xhi = ceil(P->xhi);
    }
    svg_axis_fit(&P->ylo, &P->yhi, &P->ystep);
}

static double svg_px(const svg_plot *P, double x)
{
    return SVG_LEFT + (x - P->xlo) / (P->xhi - P->xlo) * (SVG_W - SVG_LEFT - SVG_RIGHT);
}

static double svg_py(const svg_plot *P, double y)
{
    return SVG_TOP + (P->yhi - y) / (P->yhi - P->ylo) * (SVG_H - SVG_TOP - SVG_BOTTOM);
}

/* Writes text with the five XML special characters escaped. */
static void svg_put_escaped(FILE *f, const char *s)
{
    for (; *s; s++)
        switch (*s) {
        case '&': fputs("&amp;", f); break;
        case '<': fputs("&lt;", f); break;
        case '>': fputs("&gt;", f); break;
        case '"': fputs("&quot;", f); break;
        case '\'': fputs("&apos;", f); break;
        default: fputc(*s, f);
        }
}

/* Writes the tick value v: as many decimals as the step needs, or
   scientific notation for very large or very fine scales. */
static void svg_put_tick(FILE *f, double v, double step)
{
    if (fabs(v) < step * 1e-9)
        v = 0.0;
    int dec = step >= 1.0 ? 0 : (int)ceil(-log10(step) - 1e-9);
    if (dec > 8 || fabs(v) >= 1e7)
        fprintf(f, "%.4e", v);
    else
        fprintf(f, "%.*f", dec, v);
}

/* Number of tick steps across an axis (the range is whole steps). */
static slong svg_steps(double lo, double hi, double step)
{
    return (slong)floor((hi - lo) / step + 0.5);
}

/* Writes the grid, the frame, the tick labels and the names of the axes. */
static void svg_write_axes(FILE *f, const svg_plot *P)
{
    double x0 = SVG_LEFT, x1 = SVG_W - SVG_RIGHT, y0 = SVG_TOP, y1 = SVG_H - SVG_BOTTOM;
    slong nx = svg_steps(P->xlo, P->xhi, P->xstep), ny = svg_steps(P->ylo, P->yhi, P->ystep);
    fprintf(f, "<g stroke=\"#dddddd\" stroke-width=\"1\">\n");
    for (slong k = 0; k <= nx; k++) {
        double px = svg_px(P, P->xlo + (double)k * P->xstep);
        fprintf(f, "<line x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\"/>\n", px, y0, px, y1);
    }
    for (slong k = 0; k <= ny; k++) {
        double py = svg_py(P, P->ylo + (double)k * P->ystep);
        fprintf(f, "<line x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\"/>\n", x0, py, x1, py);
    }
    fprintf(f, "</g>\n<rect x=\"%.2f\" y=\"%.2f\" width=\"%.2f\" height=\"%.2f\" fill=\"none\" stroke=\"black\"/>\n", x0,
            y0, x1 - x0, y1 - y0);
    fprintf(f, "<g fill=\"black\">\n");
    for (slong k = 0; k <= nx; k++) {
        double t = P->xlo + (double)k * P->xstep;
        fprintf(f, "<text x=\"%.2f\" y=\"%.2f\" text-anchor=\"middle\">", svg_px(P, t), y1 + 16);
        svg_put_tick(f, t, P->xstep);
        fprintf(f, "</text>\n");
    }
    for (slong k = 0; k <= ny; k++) {
        double t = P->ylo + (double)k * P->ystep;
        fprintf(f, "<text x=\"%.2f\" y=\"%.2f\" text-anchor=\"end\">", x0 - 6, svg_py(P, t) + 4);
        svg_put_tick(f, t, P->ystep);
        fprintf(f, "</text>\n");
    }
    fprintf(f, "<text x=\"%.2f\" y=\"%.2f\" text-anchor=\"middle\">%s</text>\n</g>\n", (x0 + x1) / 2, y1 + 40.0,
            P->inverse ? "1/n" : "n");
}

/* Writes series i as a polyline with markers, and its legend entry. */
static void svg_write_series(FILE *f, const svg_plot *P, slong i)
{
    const svg_series *S = P->s + i;
    const char *col = svg_colours[i % (slong)(sizeof svg_colours / sizeof svg_colours[0])];
    fprintf(f, "<polyline fill=\"none\" stroke=\"%s\" stroke-width=\"1.5\" points=\"", col);
    for (slong j = 0; j < S->len; j++)
        fprintf(f, "%s%.2f,%.2f", j ? " " : "", svg_px(P, svg_x(P, j)), svg_py(P, S->y[j]));
    fprintf(f, "\"/>\n");
    if (S->len <= SVG_MARKS_UPTO) {
        fprintf(f, "<g fill=\"%s\">\n", col);
        for (slong j = 0; j < S->len; j++)
            fprintf(f, "<circle cx=\"%.2f\" cy=\"%.2f\" r=\"2.5\"/>\n", svg_px(P, svg_x(P, j)), svg_py(P, S->y[j]));
        fprintf(f, "</g>\n");
    }
    double ly = SVG_TOP + 10 + 20.0 * (double)i;
    fprintf(f, "<rect x=\"%d\" y=\"%.2f\" width=\"18\" height=\"4\" fill=\"%s\"/>\n", SVG_W - SVG_RIGHT + 14, ly - 4,
            col);
    fprintf(f, "<text x=\"%d\" y=\"%.2f\">", SVG_W - SVG_RIGHT + 38, ly + 2);
    svg_put_escaped(f, S->name);
    fprintf(f, "</text>\n");
}

/* Writes the picture into the file tmp (errors name path, what the user asked
   for). Returns NULL or a new error message. */
static char *svg_write_file(const svg_plot *P, const char *tmp, const char *path)
{
    FILE *f = fopen(tmp, "w");
    if (!f)
        return xasprintf("cannot write '%s': %s", path, strerror(errno));
    fprintf(f, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    fprintf(f, "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%d\" height=\"%d\" viewBox=\"0 0 %d %d\" "
               "font-family=\"sans-serif\" font-size=\"12\">\n", SVG_W, SVG_H, SVG_W, SVG_H);
    fprintf(f, "<rect x=\"0\" y=\"0\" width=\"%d\" height=\"%d\" fill=\"white\"/>\n", SVG_W, SVG_H);
    svg_write_axes(f, P);
    for (slong i = 0; i < P->ns; i++)
        svg_write_series(f, P, i);
    fprintf(f, "</svg>\n");
    int bad = ferror(f) ? (errno ? errno : EIO) : 0;
    if (fclose(f) != 0 && !bad)
        bad = errno;
    return bad ? xasprintf("error while writing '%s': %s", path, strerror(bad)) : NULL;
}

/* Writes the whole picture to path, through a temporary file renamed into
   place, so that a failed write leaves no half picture (a device or pipe is
   written in place). Returns NULL or a new error message. */
static char *svg_write(const svg_plot *P, const char *path)
{
    struct stat sb;
    if (stat(path, &sb) == 0 && !S_ISREG(sb.st_mode))
        return svg_write_file(P, path, path);
    char *tmp = xasprintf("%s.tmp-%ld", path, (long)getpid());
    char *err = svg_write_file(P, tmp, path);
    if (!err && rename(tmp, path) != 0)
        err = xasprintf("cannot write '%s': %s", path, strerror(errno));
    if (err)
        unlink(tmp);
    free(tmp);
    return err;
}

/* svgplot(path, series, options): see the top of the file; returns the path. */
value *toolkit_svgplot(interp *I, const node *call, value **args)
{
    if (args[0]->kind != V_STR || args[0]->str[0] == '\0')
        return builtin_fail_at(call, 0, "expected the name of the file to write, such as \"plot.svg\"");
    svg_plot P;
    svg_plot_init(&P);
    int at = 1; /* the argument an error belongs to */
    char *err = svg_read_series(&P, args[1], &I->ring);
    if (!err) {
        at = 2;
        err = svg_read_options(&P, args[2], &I->ring);
    }
    if (!err) {
        at = 0;
        svg_ranges(&P);
        err = svg_write(&P, args[0]->str);
    }
    svg_plot_clear(&P);
    if (err) {
        builtin_fail_at(call, at, err);
        free(err);
        return NULL;
    }
    return value_new_str(xstrdup(args[0]->str), &I->ring);
}
