#pragma once
// The bundled sample drop, read as the workbench reads it, for widget tests that need no window.

#include "siftwave/ledger/decision.h"
#include "widgets/common/drop_loading.h"

#include <QString>

namespace siftwave::testing {

/// samples/quenmara_current.csv through widgets::loadDrop (check `ok()` and `regionRegister`).
inline widgets::LoadedDrop loadSampleDrop() {
    widgets::LoadRequest request;
    request.dropPath = QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv");
    return widgets::loadDrop(request);
}

/// The sample's planted backlog (samples/manifest.json, P06) as a decision: 2,444 extra cases
/// of district 1301 on 2026-08-24, held back from 2026-08-03..2026-08-23, spread back in
/// proportion.
inline ledger::Decision sampleBacklogDecision() {
    ledger::Decision backlog;
    backlog.kind = ledger::DecisionKind::Redistribute;
    backlog.region = "1301";
    backlog.measure = "cases";
    backlog.date = Date::fromIso("2026-08-24");
    backlog.window = ledger::DayRange{*Date::fromIso("2026-08-03"), *Date::fromIso("2026-08-23")};
    backlog.excess = 2444;
    backlog.redistributeMethod = ledger::RedistributeMethod::Proportional;
    return backlog;
}

}  // namespace siftwave::testing
