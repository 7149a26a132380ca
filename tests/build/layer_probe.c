/* Built with the include path of one layer and a header of another (LAYER_PROBE_HEADER):
   CMakeLists.txt expects the build to fail when that header lies in a layer above, and to
   succeed for a header of the layer itself or below (the control, so that a failure means
   the include and nothing else). */
#include LAYER_PROBE_HEADER

int layer_probe_anchor(void);
int layer_probe_anchor(void) { return 0; }
