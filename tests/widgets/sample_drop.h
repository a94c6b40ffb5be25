#pragma once
// The bundled sample drop, read as the workbench reads it, for widget tests that need no window.

#include "widgets/common/drop_loading.h"

#include <QString>

namespace siftwave::testing {

/// samples/quenmara_current.csv through widgets::loadDrop (check `ok()` and `regionRegister`).
inline widgets::LoadedDrop loadSampleDrop() {
    widgets::LoadRequest request;
    request.dropPath = QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv");
    return widgets::loadDrop(request);
}

}  // namespace siftwave::testing
