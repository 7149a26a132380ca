/* Progress lines for long computations (stderr, terminals only). */
#ifndef PSIKAPPA_PROGRESS_H
#define PSIKAPPA_PROGRESS_H

typedef struct progress {
    const char *what;   /* e.g. "int_{12,0}: correlator terms" (not owned) */
    double total, start, last;
    int shown, enabled;
} progress;

/* Starts measuring a computation of `total` steps; shows nothing for the first second. */
void progress_start(progress *p, const char *what, double total);
/* Reports that `done` steps are finished; rewrites the line a few times a second. */
void progress_update(progress *p, double done);
/* Erases the line, if one was shown. */
void progress_end(progress *p);

/* For a step that cannot report inside: a line saying what runs and its estimate,
   shown when the estimate is long; progress_clear_note erases it afterwards. */
void progress_note(const char *what, double seconds);
void progress_clear_note(double seconds);

#endif
