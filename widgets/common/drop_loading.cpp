#include "widgets/common/drop_loading.h"

namespace siftwave::widgets {

LoadedDrop loadDrop(const LoadRequest& request) {
    LoadedDrop loaded;
    Result<Drop> drop = ingest::readDrop(request.dropPath.toStdString(), request.options);
    if (!drop) {
        loaded.error = drop.error();
        return loaded;
    }
    loaded.drop = std::make_shared<const Drop>(std::move(drop).value());

    if (!request.withRegister)
        return loaded;
    const std::string registerPath = request.registerPath.isEmpty()
                                         ? ingest::registerBeside(request.dropPath.toStdString())
                                         : request.registerPath.toStdString();
    if (!registerPath.empty()) {
        Result<RegionRegister> regionRegister = ingest::readRegister(registerPath);
        if (regionRegister)
            loaded.regionRegister =
                std::make_shared<const RegionRegister>(std::move(regionRegister).value());
        else
            loaded.registerError = regionRegister.error();
    }
    return loaded;
}

QString describeError(const Error& error) {
    return QString::fromStdString(error.describe());
}

}  // namespace siftwave::widgets
