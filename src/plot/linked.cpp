// SPDX-License-Identifier: Apache-2.0
// require_drawing for programs that link the drawing code itself (the tests): nothing to load.
#include "plot/module.h"

namespace cw::plot {

void require_drawing() {}

}  // namespace cw::plot
