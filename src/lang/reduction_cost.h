/* Predicted running time of the pushforward reduction and the correlator
   table, from their size estimates, checked against --max-seconds before
   any work (the volume engine and series operations have their own). */
#ifndef PSIKAPPA_REDUCTION_COST_H
#define PSIKAPPA_REDUCTION_COST_H

#include "interp.h"

/* Seconds for `entries` correlator table entries and `terms` reduction terms. */
double reduction_seconds(double entries, double terms);

/* 1 when the prediction is within --max-seconds, else reports at `where`
   (naming the estimate and the option) and returns 0. */
int reduction_seconds_ok(interp *I, const node *where, double entries, double terms);

#endif
