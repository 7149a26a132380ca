/* The wall-clock end of --time-limit, for waits that cannot poll the
   cancel flag (e.g. a database's busy timeout): they are capped by the time
   that is left, so that the limit holds while another process keeps a lock. */
#ifndef PSIKAPPA_DEADLINE_H
#define PSIKAPPA_DEADLINE_H

/* Records that the run ends `seconds` from now (0 or less: no deadline). */
void deadline_start(double seconds);

/* Seconds left before the deadline (0 once it has passed), or -1 without one. */
double deadline_left(void);

/* cap_ms, or the milliseconds left before the deadline when fewer (0 once
   it has passed). */
int deadline_cap_ms(int cap_ms);

#endif
