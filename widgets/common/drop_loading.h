#pragma once
// Opening a drop: the core reads the file and finds and reads the region register beside it
// (siftwave::ingest::registerBeside), when there is one; this only gathers the results for the
// window. loadDrop() blocks; run it through BackgroundTask.

#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"

#include <QString>

#include <memory>
#include <optional>

namespace siftwave::widgets {

struct LoadRequest {
    QString dropPath;
    QString registerPath;      // empty: siftwave::ingest::registerBeside(dropPath) (core)
    bool withRegister = true;  // false: read the drop only
    ingest::IngestOptions options;
};

struct LoadedDrop {
    std::shared_ptr<const Drop> drop;                      // null when the drop could not be read
    std::shared_ptr<const RegionRegister> regionRegister;  // null when none was found or it failed
    std::optional<Error> error;                            // why the drop could not be read
    std::optional<Error> registerError;  // a register was found but could not be read

    bool ok() const { return drop != nullptr; }
};

/// Reads the drop and its register with the core readers.
LoadedDrop loadDrop(const LoadRequest& request);

/// "file:line:column: message" for a person, as the core describes it.
QString describeError(const Error& error);

}  // namespace siftwave::widgets
