/* The version of the engines' answers, the key under which the results store keeps them.
   Bump it whenever a change could alter an answer, so that old answers are never reused; then
   refresh the record of tests/unit/engine_answers.txt (build/test_engine_version --refresh),
   which the unit test test_engine_version compares with fresh answers. */
#ifndef PSIKAPPA_ENGINE_VERSION_H
#define PSIKAPPA_ENGINE_VERSION_H

#define RESULTS_ENGINE_VERSION "psikappa-engine-1"

#endif
